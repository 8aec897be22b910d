export { mailConfigSchema, mailConfigShape } from './mail.config';
export type { MailEnv } from './mail.config';
export { createMailTransport } from './transport';
export type { MailTransport } from './transport';
export { MailDataError, renderMail } from './render';
export type { RenderedMail } from './render';
export { mailTemplates } from './templates';
export type { MailData, MailTemplateName } from './templates';
export { PETROL } from './layout';
