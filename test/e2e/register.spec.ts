import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { createHmac } from 'node:crypto';
import type { Locator, Page } from 'playwright-core';
import yauzl from 'yauzl';
import { outboxMessageSchema, type OutboxMessage } from '@trabeate/contracts';
import { linkQuery } from '../../apps/server/src/transmittals/signed-links';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// A drawing from its registration to the client's acknowledgement, in four browsers: the engineer
// registers a drawing on Kestrel Yard and uploads its first revision's PDF; the principal puts a
// second engineer on the project's team, and that engineer checks it (the first engineer drew it,
// so may not); the principal approves it, then issues it by transmittal to the client contact and
// an outside address. The outbox holds both mails; the
// client finds the drawing, downloads it and the ZIP and acknowledges; the outside recipient's
// signed link downloads, and the same link with an expiry in the past is refused.

type Browser = Awaited<ReturnType<typeof openBrowser>>;

// Each step is several page loads in a real browser; on a loaded shared machine one took longer
// than Jest's default minute, so the steps get three (a limit, not a measured target).
jest.setTimeout(180_000);

/** A small, well-formed one-page PDF (the server sniffs the content, so it must really be one). */
function writePdf(dir: string, name: string): string {
  const objects = [
    '1 0 obj\n<< /Type /Catalog /Pages 2 0 R >>\nendobj\n',
    '2 0 obj\n<< /Type /Pages /Kids [3 0 R] /Count 1 >>\nendobj\n',
    '3 0 obj\n<< /Type /Page /Parent 2 0 R /MediaBox [0 0 1684 2384] >>\nendobj\n',
  ];
  let body = '%PDF-1.4\n';
  const offsets: number[] = [];
  for (const o of objects) {
    offsets.push(body.length);
    body += o;
  }
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const off of offsets) body += `${String(off).padStart(10, '0')} 00000 n \n`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  const file = path.join(dir, name);
  writeFileSync(file, body, 'latin1');
  return file;
}

/** The entry names of a ZIP held in memory. */
function zipEntries(data: Buffer): Promise<string[]> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(data, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err ?? new Error('not a zip'));
      const names: string[] = [];
      zip.on('entry', (e: yauzl.Entry) => {
        names.push(e.fileName);
        zip.readEntry();
      });
      zip.on('end', () => resolve(names));
      zip.on('error', reject);
      zip.readEntry();
    });
  });
}

describe('a drawing from registration to the client’s acknowledgement, in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  const outbox = testEnv('E2E_OUTBOX_URL');
  // The same key the e2e API derives from its session secret for outside recipients' links (app.ts).
  const linkSecret = createHmac('sha256', testEnv('E2E_SESSION_SECRET')).update('trabeate transmittal links').digest();
  // New invented names each run: the e2e database is shared by every browser test and kept.
  const run = Date.now().toString(36).toUpperCase();
  const number = `S-E2E-${run}`;
  const title = `Level 2 transfer beam layout ${run}`;
  const pdfName = `transfer-beams-${run.toLowerCase()}.pdf`;
  const outsider = `site.office.${run.toLowerCase()}@harlowmere-build.example`;
  const kestrel = DEMO.projects.kestrel.id;
  const registerUrl = `${base}/drawings?project=${kestrel}`;
  let engineer: Browser;
  let checker: Browser;
  let principal: Browser;
  let client: Browser;
  let tmp = '';
  let reference = '';
  let outsideMail: OutboxMessage | undefined;

  const testId = (page: Page, id: string): Locator => page.locator(`[data-testid="${id}"]`);
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: path.join(SCREENSHOTS, `register-${name}.png`), fullPage: true });

  async function signIn(page: Page, url: string, user: { email: string; name: string }): Promise<void> {
    await page.goto(url);
    await testId(page, 'sign-in').click({ timeout: 20_000 });
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', user.email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await testId(page, 'user-name').filter({ hasText: user.name }).waitFor({ timeout: 20_000 });
  }

  /** Opens the register at this run's drawing, its detail beside the table. */
  async function openDrawing(page: Page): Promise<Locator> {
    await page.goto(registerUrl);
    const row = testId(page, 'drawings-table').getByRole('button', { name: number });
    await row.waitFor({ timeout: 20_000 });
    await row.click();
    const detail = testId(page, 'drawing-detail').filter({ hasText: number });
    await detail.waitFor({ timeout: 20_000 });
    return detail;
  }

  async function mailTo(address: string, subject: string): Promise<OutboxMessage | undefined> {
    const list = (await (await fetch(`${outbox}/messages`)).json()) as Array<{
      id: string;
      to: string[];
      subject: string;
    }>;
    const m = list.find((x) => x.subject === subject && x.to.some((to) => to.toLowerCase() === address));
    return m ? outboxMessageSchema.parse(await (await fetch(`${outbox}/messages/${m.id}`)).json()) : undefined;
  }

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(tmpdir(), 'trabeate-e2e-register-'));
    engineer = await openBrowser();
    principal = await openBrowser();
    client = await openBrowser();
    // The fourth browser opens when the second engineer's turn comes (four starting at once can
    // outlast the hook's time on a loaded machine).
  }, 120_000);
  afterAll(async () => {
    await engineer?.close();
    await checker?.close();
    await principal?.close();
    await client?.close();
    if (tmp) rmSync(tmp, { recursive: true, force: true });
  });

  it('the engineer registers a new drawing on Kestrel Yard and uploads its first revision’s PDF', async () => {
    const page = engineer.page;
    await signIn(page, registerUrl, DEMO.users.engineerA);
    await testId(page, 'new-drawing').click({ timeout: 20_000 });
    await testId(page, 'drawing-number').fill(number);
    await testId(page, 'drawing-title').fill(title);
    // A scale the register does not know is flagged as it is typed.
    await testId(page, 'drawing-scale').fill('one to fifty');
    await testId(page, 'drawing-title').click();
    await page.getByText('1:100, NTS or As shown').waitFor();
    await testId(page, 'drawing-scale').fill('1:50');
    await testId(page, 'create-drawing').click();

    const detail = testId(page, 'drawing-detail').filter({ hasText: number });
    await detail.waitFor({ timeout: 20_000 });
    await testId(page, 'revision-description').fill('First issue of the transfer beams for coordination');
    await testId(page, 'register-revision').click();
    const upload = detail.locator('[data-testid="upload-pdf"]');
    await upload.waitFor({ state: 'attached', timeout: 20_000 });
    // Nothing to check before the PDF is there.
    expect(await testId(page, 'revision-check').count()).toBe(0);
    await upload.setInputFiles(writePdf(tmp, pdfName));
    await detail.locator('[data-testid="file-download"]').filter({ hasText: pdfName }).waitFor({ timeout: 20_000 });
    // The engineer drew it, so the engineer may not check it.
    expect(await testId(page, 'revision-check').count()).toBe(0);
    await expect(detail.locator('tb-state-marker').first().textContent()).resolves.toMatch(/draft/i);
    await shot(page, '1-registered');
  });

  it('the principal puts a second engineer on Kestrel Yard’s team', async () => {
    const page = principal.page;
    await signIn(page, registerUrl, DEMO.users.principal);
    // Through the API as the signed-in principal (the call the project page makes). Adding someone
    // already on the team changes nothing, so the kept e2e database may have it from an earlier run.
    const status = await page.evaluate(
      async ([projectId, userId]) => {
        const token = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]*)/.exec(document.cookie)?.[1] ?? '');
        const res = await fetch(`/api/projects/${projectId}/members/${userId}`, {
          method: 'PUT',
          headers: { 'X-XSRF-TOKEN': token },
        });
        return res.status;
      },
      [kestrel, DEMO.users.engineerB.id] as const,
    );
    expect(status).toBe(204);
  });

  it('the second engineer, who did not draw it, checks the revision', async () => {
    checker = await openBrowser();
    const page = checker.page;
    await signIn(page, registerUrl, DEMO.users.engineerB);
    const detail = await openDrawing(page);
    await expect(detail.textContent()).resolves.toContain(`Drawn by ${DEMO.users.engineerA.name}`);
    await detail.locator('[data-testid="revision-check"]').click({ timeout: 20_000 });
    await detail.filter({ hasText: `checked by ${DEMO.users.engineerB.name}` }).waitFor({ timeout: 20_000 });
    // Approval is the principal's alone.
    expect(await detail.locator('[data-testid="revision-approve"]').count()).toBe(0);
  }, 120_000);

  it('the principal approves the checked revision', async () => {
    const page = principal.page;
    const detail = await openDrawing(page);
    await detail.filter({ hasText: `checked by ${DEMO.users.engineerB.name}` }).waitFor({ timeout: 20_000 });
    expect(await detail.locator('[data-testid="revision-check"]').count()).toBe(0);
    await detail.locator('[data-testid="revision-approve"]').click({ timeout: 20_000 });
    await detail.filter({ hasText: `approved by ${DEMO.users.principal.name}` }).waitFor({ timeout: 20_000 });
    await expect(detail.textContent()).resolves.toContain(`Drawn by ${DEMO.users.engineerA.name}`);
  });

  it('the principal issues it by transmittal to the client contact and an outside address', async () => {
    const page = principal.page;
    const mine = testId(page, `issue-${number}`);
    await mine.waitFor({ timeout: 20_000 });
    await mine.locator('input[type="checkbox"]').check();
    await testId(page, `contact-${DEMO.users.fenwickContact.id}`).locator('input[type="checkbox"]').check();
    await testId(page, 'issue-externals').fill('not an address');
    await testId(page, 'issue-externals').blur();
    await page.getByText('Not an e-mail address').waitFor();
    await testId(page, 'issue-externals').fill(outsider);
    await shot(page, '2-issue-form');
    await testId(page, 'issue-submit').click();

    const detail = testId(page, 'transmittal-detail').filter({ hasText: number });
    await detail.waitFor({ timeout: 20_000 });
    reference = ((await detail.locator('h3 .mono').textContent()) ?? '').trim();
    expect(reference).not.toBe('');
    const recipients = (await testId(page, 'recipients').textContent()) ?? '';
    expect(recipients).toContain(DEMO.users.fenwickContact.name);
    expect(recipients).toContain(outsider);
    await shot(page, '3-issued');
  });

  it('the outbox holds the mail to the client contact and the one to the outside address', async () => {
    const subject = `Kestrel Yard apartments: drawings issued under ${reference}`;
    let toClient: OutboxMessage | undefined;
    // Mail goes out through the job queue; poll until both have arrived.
    for (let i = 0; i < 40 && !(toClient && outsideMail); i++) {
      toClient ??= await mailTo(DEMO.users.fenwickContact.email, subject);
      outsideMail ??= await mailTo(outsider, subject);
      if (!(toClient && outsideMail)) await new Promise((r) => setTimeout(r, 500));
    }
    expect(toClient?.text).toContain(number);
    expect(toClient?.text).toContain(`${base}/drawings?project=${kestrel}&transmittal=`);
    expect(outsideMail?.text).toContain(number);
    expect(outsideMail?.text).toContain(`${base}/api/shared/transmittals/`);

    // The principal sees both in the development outbox page too.
    const page = principal.page;
    await testId(page, 'nav-outbox').click();
    await page.waitForURL(/\/dev\/outbox$/);
    const items = testId(page, 'outbox-item').filter({ hasText: reference });
    await items.first().waitFor({ timeout: 20_000 });
    await expect(items.count()).resolves.toBe(2);
  });

  it('the client finds the drawing, downloads it and the ZIP, and acknowledges receipt', async () => {
    const page = client.page;
    await signIn(page, registerUrl, DEMO.users.fenwickContact);
    const detail = await openDrawing(page);
    await expect(detail.textContent()).resolves.toContain(title);

    const [pdf] = await Promise.all([
      page.waitForEvent('download'),
      detail.locator('[data-testid="file-download"]').filter({ hasText: pdfName }).click(),
    ]);
    expect(pdf.suggestedFilename()).toBe(pdfName);
    expect(
      readFileSync((await pdf.path())!)
        .subarray(0, 5)
        .toString('latin1'),
    ).toBe('%PDF-');

    await testId(page, 'transmittal-list').getByRole('button', { name: reference }).click();
    const transmittal = testId(page, 'transmittal-detail').filter({ hasText: reference });
    await transmittal.waitFor({ timeout: 20_000 });
    const [zip] = await Promise.all([page.waitForEvent('download'), testId(page, 'zip-download').click()]);
    const entries = await zipEntries(readFileSync((await zip.path())!));
    expect(entries.some((e) => e.endsWith(pdfName))).toBe(true);

    await testId(page, 'acknowledge').click();
    // "Acknowledged" now, in words beside its glyph (not "Awaiting your acknowledgement").
    await testId(page, 'transmittal-list')
      .locator('li')
      .filter({ hasText: reference })
      .filter({ hasText: 'Acknowledged' })
      .waitFor({ timeout: 20_000 });
    // the detail beside the list reloads a moment later: its button goes then (CI once counted it first)
    await testId(page, 'acknowledge').waitFor({ state: 'detached', timeout: 20_000 });
    await expect(testId(page, 'acknowledge').count()).resolves.toBe(0);
    await shot(page, '4-client-acknowledged');
  });

  it('the outside recipient’s link downloads the PDF, and the same link with a past expiry is refused', async () => {
    const link = outsideMail?.text.match(
      /http:\/\/[\w.:]+\/api\/shared\/transmittals\/[0-9a-f-]{36}\/[0-9a-f-]{36}\?r=[0-9a-f-]+&e=\d+&s=[\w-]+/,
    )?.[0];
    expect(link).toBeDefined();
    const url = new URL(link!);
    const res = await fetch(url);
    expect(res.status).toBe(200);
    expect(
      Buffer.from(await res.arrayBuffer())
        .subarray(0, 5)
        .toString('latin1'),
    ).toBe('%PDF-');

    const [, , , , transmittalId, item] = url.pathname.split('/');
    const expired = linkQuery(linkSecret, {
      transmittalId: transmittalId!,
      recipientId: url.searchParams.get('r')!,
      item: item!,
      expires: Math.floor(Date.now() / 1000) - 3600,
    });
    const refused = await fetch(`${url.origin}${url.pathname}?${expired}`);
    expect(refused.status).toBe(403);
    expect(JSON.stringify(await refused.json())).toMatch(/expired/);
  });

  it('asked for nothing outside loopback and logged no errors', () => {
    for (const b of [engineer, checker, principal, client]) {
      expect(b.outside).toEqual([]);
      expect(b.consoleErrors).toEqual([]);
    }
  });
});
