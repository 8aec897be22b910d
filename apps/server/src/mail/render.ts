import Handlebars from 'handlebars';
import { footer, htmlButton, htmlLayout, textLayout } from './layout';
import { mailTemplates, type MailData, type MailTemplateName } from './templates';

export interface RenderedMail {
  subject: string;
  html: string;
  text: string;
}

// Two environments: HTML escapes every value; plain text must not (an "&" stays an "&").
const html = Handlebars.create();
const text = Handlebars.create();
html.registerPartial('button', htmlButton);
html.registerPartial('footer', footer);
text.registerPartial('footer', footer);

const strict = { strict: true } as const;
type Compiled = {
  subject: HandlebarsTemplateDelegate;
  html: HandlebarsTemplateDelegate;
  text: HandlebarsTemplateDelegate;
};
const compiled = new Map<MailTemplateName, Compiled>();
const htmlFrame = html.compile(htmlLayout, strict);
const textFrame = text.compile(textLayout, { ...strict, noEscape: true });

function templateOf(name: MailTemplateName): Compiled {
  let t = compiled.get(name);
  if (!t) {
    const src = mailTemplates[name];
    t = {
      subject: text.compile(src.subject, { ...strict, noEscape: true }),
      html: html.compile(src.html, { knownHelpersOnly: true }),
      text: text.compile(src.text, { noEscape: true, knownHelpersOnly: true }),
    };
    compiled.set(name, t);
  }
  return t;
}

export class MailDataError extends Error {
  constructor(
    readonly template: string,
    readonly problems: string[],
  ) {
    super(`Mail "${template}" has invalid data: ${problems.join('; ')}`);
    this.name = 'MailDataError';
  }
}

/** Renders a notice; throws MailDataError when the data does not fit the template. */
export function renderMail<N extends MailTemplateName>(name: N, data: MailData<N>): RenderedMail {
  const source = mailTemplates[name];
  if (!source) throw new MailDataError(String(name), ['no such template']);
  const parsed = source.data.safeParse(data);
  if (!parsed.success) {
    throw new MailDataError(
      name,
      parsed.error.issues.map((i) => `${i.path.join('.') || '(data)'} ${i.message}`),
    );
  }
  const values = parsed.data as Record<string, unknown>;
  const t = templateOf(name);
  // Subjects are single lines: a newline in a project name must not end up in a header.
  const subject = t
    .subject(values)
    .replace(/[\r\n]+/g, ' ')
    .trim();
  return {
    subject,
    html: htmlFrame({ ...values, subject, body: t.html(values) }),
    text: textFrame({
      ...values,
      body: t
        .text(values)
        .replace(/\n{3,}/g, '\n\n')
        .trim(),
    }),
  };
}
