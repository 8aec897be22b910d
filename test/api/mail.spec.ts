import { createMailTransport, mailConfigSchema, MailDataError, renderMail } from '../../apps/server/src/mail';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { startFakeSmtp } from '../support/fakes';

const firm = { firmName: 'Halvorsen & Pike Structures' };

describe('mail templates', () => {
  it('stage submitted: names the stage, project and sender in HTML and text, with the link and the note', () => {
    const m = renderMail('stage-submitted', {
      ...firm,
      recipientName: 'Odile Brask',
      projectName: 'Kestrel Yard',
      stageName: 'Scheme design',
      submittedBy: 'Tomas Ingle',
      note: 'Two schemes attached.\nScheme B drops column C4.',
      link: 'http://127.0.0.1:4310/projects/42/stages/2',
    });
    expect(m.subject).toBe('Kestrel Yard: Scheme design is ready for your review');
    for (const body of [m.html, m.text]) {
      expect(body).toContain('Odile Brask');
      expect(body).toContain('Tomas Ingle');
      expect(body).toContain('http://127.0.0.1:4310/projects/42/stages/2');
      expect(body).toContain('Scheme B drops column C4.');
      expect(body).toContain('Sent by Trabeate on behalf of');
    }
    expect(m.html).toContain('<a href="http://127.0.0.1:4310/projects/42/stages/2"');
    expect(m.html).toContain('#016973');
    // The firm's "&" is escaped in HTML and left alone in plain text.
    expect(m.html).toContain('Halvorsen &amp; Pike Structures');
    expect(m.text).toContain('Halvorsen & Pike Structures');
    expect(m.text).not.toMatch(/<[a-z]/i);
  });

  it('stage returned carries the comment; markup in a comment is shown, never run', () => {
    const m = renderMail('stage-returned', {
      ...firm,
      recipientName: 'Tomas Ingle',
      projectName: 'Kestrel Yard',
      stageName: 'Scheme design',
      returnedBy: 'Odile Brask',
      comment: 'Please check the strap footing at C1 <script>alert(1)</script>',
      link: 'http://127.0.0.1:4310/projects/42/stages/2',
    });
    expect(m.subject).toBe('Kestrel Yard: Scheme design was returned with comments');
    expect(m.html).toContain('Please check the strap footing at C1 &lt;script&gt;');
    expect(m.html).not.toContain('<script>');
    expect(m.text).toContain('Please check the strap footing at C1 <script>alert(1)</script>');
  });

  it('stage approved and invitation render their own wording and links', () => {
    const approved = renderMail('stage-approved', {
      ...firm,
      recipientName: 'Tomas Ingle',
      projectName: 'Kestrel Yard',
      stageName: 'Scheme design',
      approvedBy: 'Odile Brask',
      link: 'http://127.0.0.1:4310/projects/42/stages/2',
    });
    expect(approved.subject).toBe('Kestrel Yard: Scheme design is approved');
    expect(approved.text).toContain('Odile Brask has approved Scheme design of Kestrel Yard.');

    const invite = renderMail('invitation', {
      ...firm,
      invitedBy: 'Maren Holt',
      role: 'engineer',
      link: 'http://127.0.0.1:4310/invitations/abc123',
      expiresOn: '15 December 2026',
    });
    expect(invite.subject).toBe('Maren Holt invites you to Halvorsen & Pike Structures on Trabeate');
    expect(invite.text.startsWith('Hello,')).toBe(true);
    expect(invite.html).toContain('href="http://127.0.0.1:4310/invitations/abc123"');
    expect(invite.text).toContain('works until 15 December 2026');
  });

  it('no template loads anything from outside: no images, fonts or style sheets by URL', () => {
    const m = renderMail('stage-approved', {
      ...firm,
      recipientName: 'A',
      projectName: 'B',
      stageName: 'C',
      approvedBy: 'D',
      link: 'http://127.0.0.1:4310/x',
    });
    expect(m.html).not.toMatch(/<img|<link|@import|url\(|@font-face/i);
  });

  it('data that does not fit the template is refused before anything is sent', () => {
    expect(() =>
      renderMail('stage-returned', {
        ...firm,
        recipientName: 'A',
        projectName: 'B',
        stageName: 'C',
        returnedBy: 'D',
        comment: '',
        link: 'http://x/y',
      }),
    ).toThrow(MailDataError);
    expect(() =>
      renderMail('invitation', { ...firm, invitedBy: 'A', role: 'engineer', link: 'not a link', expiresOn: 'soon' }),
    ).toThrow(/link/);
  });

  it('a newline in a project name cannot break out of the subject line', () => {
    const m = renderMail('stage-approved', {
      ...firm,
      recipientName: 'A',
      projectName: 'Yard\r\nBcc: someone@example.invalid',
      stageName: 'C',
      approvedBy: 'D',
      link: 'http://127.0.0.1:4310/x',
    });
    expect(m.subject).not.toMatch(/[\r\n]/);
  });
});

describe('mail transport and the local SMTP fake', () => {
  let smtp: FakeSmtp;
  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: 0 });
  });
  afterAll(() => smtp.stop());

  it('a sent notice can be read from the fake at once, and through its outbox API', async () => {
    const config = mailConfigSchema.parse({ SMTP_HOST: '127.0.0.1', SMTP_PORT: String(smtp.port) });
    const transport = createMailTransport(config);
    const m = renderMail('stage-approved', {
      ...firm,
      recipientName: 'Tomas Ingle',
      projectName: 'Kestrel Yard',
      stageName: 'Scheme design',
      approvedBy: 'Odile Brask',
      link: 'http://127.0.0.1:4310/projects/42/stages/2',
    });
    await transport.sendMail({ from: config.MAIL_FROM, to: 'tomas.ingle@example.invalid', ...m });
    transport.close();
    // Stored before the server acknowledged: no waiting needed.
    const got = smtp.messages.at(-1)!;
    expect(got).toMatchObject({
      subject: m.subject,
      to: ['tomas.ingle@example.invalid'],
      envelope: { to: ['tomas.ingle@example.invalid'] },
    });
    expect(got.text).toContain('Odile Brask has approved Scheme design');
    expect(got.html).toContain('#016973');

    const outbox = `http://127.0.0.1:${smtp.httpPort}`;
    const list = (await (await fetch(`${outbox}/messages`)).json()) as Array<{
      id: string;
      subject: string;
      html?: string;
    }>;
    expect(list[0]).toMatchObject({ id: got.id, subject: m.subject });
    expect(list[0].html).toBeUndefined();
    const one = (await (await fetch(`${outbox}/messages/${got.id}`)).json()) as { text: string };
    expect(one.text).toContain('Odile Brask');
    expect((await fetch(`${outbox}/messages/nope`)).status).toBe(404);
    expect((await fetch(`${outbox}/messages`, { method: 'DELETE' })).status).toBe(200);
    expect(await (await fetch(`${outbox}/messages`)).json()).toEqual([]);
  });

  it('messages kept in a folder are there again after the fake restarts', async () => {
    const { mkdtempSync, rmSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const dir = mkdtempSync(`${tmpdir()}/trabeate-mail-`);
    const first = await startFakeSmtp({ directory: dir, httpPort: null });
    const transport = createMailTransport(mailConfigSchema.parse({ SMTP_PORT: String(first.port) }));
    await transport.sendMail({
      from: 'a@example.invalid',
      to: 'b@example.invalid',
      subject: 'kept',
      text: 'kept across restarts',
    });
    transport.close();
    await first.stop();
    const second = await startFakeSmtp({ directory: dir, httpPort: null });
    expect(second.messages.map((m) => m.subject)).toEqual(['kept']);
    await second.stop();
    rmSync(dir, { recursive: true, force: true });
  });
});
