import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// The engineer generates the calculation report of scheme A and registers its plan sheet as a
// draft revision of a new drawing; the principal finds that draft in the register. The report's
// first pages and the sheet are rendered to PNG with pdftoppm (Debian's poppler-utils) to look at.

type Browser = Awaited<ReturnType<typeof openBrowser>>;

/** Renders pages of a PDF to PNG under the screenshots folder (first..last, 1-based). */
function renderPdf(pdf: Buffer, name: string, first: number, last: number): string[] {
  const dir = mkdtempSync(path.join(tmpdir(), 'trabeate-pdf-'));
  try {
    const file = path.join(dir, 'in.pdf');
    writeFileSync(file, pdf);
    execFileSync('pdftoppm', [
      '-png',
      '-r',
      '70',
      '-f',
      String(first),
      '-l',
      String(last),
      file,
      path.join(dir, 'page'),
    ]);
    return readdirSync(dir)
      .filter((f) => f.endsWith('.png'))
      .sort()
      .map((f, i) => {
        const to = path.join(SCREENSHOTS, `${name}-${i + first}.png`);
        renameSync(path.join(dir, f), to);
        return to;
      });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('scheme outputs, in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  const kestrel = DEMO.projects.kestrel.id;
  const title = `Column layout from scheme A ${Date.now().toString(36)}`;
  let engineer: Browser;
  let principal: Browser;
  let drawingNumber = '';
  const testId = (page: Page, id: string): Locator => page.locator(`[data-testid="${id}"]`);
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: path.join(SCREENSHOTS, `scheme-outputs-${name}.png`), fullPage: true });

  async function signIn(page: Page, url: string, email: string): Promise<void> {
    await page.goto(url);
    await testId(page, 'sign-in').click({ timeout: 20_000 });
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
  }

  beforeAll(async () => {
    engineer = await openBrowser();
    principal = await openBrowser();
  });
  afterAll(async () => {
    await engineer?.close();
    await principal?.close();
  });

  it('the engineer previews the plan sheet of scheme A and generates its calculation report', async () => {
    const page = engineer.page;
    await signIn(page, `${base}/projects/${kestrel}/schemes/${DEMO_SCHEMES.full.id}`, DEMO.users.engineerA.email);
    await testId(page, 'outputs-toggle').click({ timeout: 30_000 });
    await testId(page, 'sheet-preview').waitFor({ timeout: 30_000 });
    await testId(page, 'report-generate').click();
    const open = testId(page, 'report-open');
    await open.waitFor({ timeout: 90_000 });
    await expect(testId(page, 'report-status').textContent()).resolves.toMatch(/Ready\s*\d+ pages/);
    await shot(page, '1-report-ready');

    const report = await page.request.get(new URL((await open.getAttribute('href'))!, base).toString());
    expect(report.status()).toBe(200);
    expect(report.headers()['content-type']).toBe('application/pdf');
    expect(renderPdf(await report.body(), 'scheme-outputs-report-page', 1, 3)).toHaveLength(3);

    const sheet = await page.request.get(
      new URL((await testId(page, 'sheet-pdf').getAttribute('href'))!, base).toString(),
    );
    expect(sheet.status()).toBe(200);
    expect(renderPdf(await sheet.body(), 'scheme-outputs-plan-sheet', 1, 1)).toHaveLength(1);
    expect(engineer.outside).toEqual([]);
  });

  it('the engineer registers the plan sheet as a draft revision of a new drawing', async () => {
    const page = engineer.page;
    await testId(page, 'register-title').fill(title);
    await testId(page, 'register-submit').click();
    const done = testId(page, 'register-done');
    await done.waitFor({ timeout: 30_000 });
    const text = (await done.textContent()) ?? '';
    // the version the page opened: another browser test may have saved scheme A since the seed
    expect(text).toMatch(/Revision P01 of .+ registered from version \d+/);
    drawingNumber = /Revision P01 of (.+?) registered/.exec(text)![1];
    await shot(page, '2-sheet-registered');
  });

  it('the principal finds the draft revision in the drawing register', async () => {
    const page = principal.page;
    await signIn(page, `${base}/drawings?project=${kestrel}`, DEMO.users.principal.email);
    const row = testId(page, 'drawings-table').getByRole('button', { name: drawingNumber });
    await row.waitFor({ timeout: 30_000 });
    await row.click();
    const detail = testId(page, 'drawing-detail').filter({ hasText: drawingNumber });
    await detail.waitFor({ timeout: 20_000 });
    await expect(detail.textContent()).resolves.toContain(title);
    await expect(detail.textContent()).resolves.toMatch(/P01[\s\S]*Draft/i);
    await shot(page, '3-principal-register');
    expect(principal.outside).toEqual([]);
  });
});
