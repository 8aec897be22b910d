import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// One design stage from start to approval, as two people in two browsers: the principal creates a
// project and assigns the stage; the engineer uploads a deliverable and submits; the principal
// returns it with a comment; the engineer submits again; the principal approves. The development
// outbox then holds the three notices.

type Browser = Awaited<ReturnType<typeof openBrowser>>;

/** A small, well-formed one-page PDF (the server sniffs the content, so it must really be one). */
function writePdf(dir: string): string {
  const objects = [
    '1 0 obj\n<< /Type /Catalog /Pages 2 0 R >>\nendobj\n',
    '2 0 obj\n<< /Type /Pages /Kids [3 0 R] /Count 1 >>\nendobj\n',
    '3 0 obj\n<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] >>\nendobj\n',
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
  const file = path.join(dir, 'design-basis-report.pdf');
  writeFileSync(file, body, 'latin1');
  return file;
}

describe('a design stage from assignment to approval, in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  const reference = `E2E-${Date.now().toString(36).toUpperCase()}`;
  const projectName = `Wrenfield Court ${reference}`;
  let principal: Browser;
  let engineer: Browser;
  let projectUrl = '';
  let tmp = '';

  const testId = (page: Page, id: string): Locator => page.locator(`[data-testid="${id}"]`);
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: path.join(SCREENSHOTS, `projects-${name}.png`), fullPage: true });

  async function signIn(page: Page, url: string, user: { email: string; name: string }): Promise<void> {
    await page.goto(url);
    await testId(page, 'sign-in').click({ timeout: 20_000 });
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', user.email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await testId(page, 'user-name').filter({ hasText: user.name }).waitFor({ timeout: 20_000 });
  }

  /** Picks an option of a Material select by its visible text. */
  async function choose(page: Page, select: string, option: string): Promise<void> {
    await testId(page, select).click();
    await page.getByRole('option', { name: option }).click();
  }

  const stageState = (page: Page) => testId(page, 'stage-panel').locator('[data-testid="stage-state"]');

  async function expectState(page: Page, text: string): Promise<void> {
    await stageState(page).filter({ hasText: text }).waitFor({ timeout: 20_000 });
  }

  /** Opens the project at the design basis stage, fresh from the server. */
  async function openStage(page: Page): Promise<void> {
    await page.goto(`${projectUrl}?stage=design_basis`);
    await testId(page, 'stage-panel').waitFor({ timeout: 20_000 });
  }

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(tmpdir(), 'trabeate-e2e-files-'));
    principal = await openBrowser();
    engineer = await openBrowser();
  });
  afterAll(async () => {
    await principal?.close();
    await engineer?.close();
    if (tmp) rmSync(tmp, { recursive: true, force: true });
  });

  it('the principal creates a project and assigns the demo engineer to its design basis stage', async () => {
    const page = principal.page;
    await signIn(page, `${base}/projects`, DEMO.users.principal);
    await testId(page, 'projects-table').waitFor({ timeout: 20_000 });
    await testId(page, 'new-project').click();

    await testId(page, 'field-reference').fill(reference);
    await testId(page, 'field-name').fill(projectName);
    await choose(page, 'field-clientOrganisationId', DEMO.clients.fenwick.name);
    await testId(page, 'field-siteAddress').fill('12 Lantern Row, Eastmere');
    await testId(page, 'field-buildingUse').fill('Apartments over ground-floor shops');
    await testId(page, 'field-storeys').fill('6');
    await choose(page, 'field-codeFamily', 'IS 456 with IS 875 loads');
    await testId(page, 'field-concreteMPa').fill('25');
    await testId(page, 'field-steelMPa').fill('415');
    // A value past the contract's limit is flagged as it is typed, before anything is sent.
    await testId(page, 'field-bearingPressureKPa').fill('9000');
    await page.getByText('Allowable bearing pressure can be at most 5000 kPa.').waitFor();
    await testId(page, 'field-bearingPressureKPa').fill('180');
    // Unit rates have no starting values: the firm's own prices, typed in.
    await testId(page, 'field-concretePerM3').fill('130');
    await testId(page, 'field-steelPerKg').fill('1.2');
    await testId(page, 'field-formworkPerM2').fill('28');
    await shot(page, '1-new-project-form');
    await testId(page, 'save-project').click();

    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/, { timeout: 20_000 });
    projectUrl = page.url();
    await expect(testId(page, 'project-name').textContent()).resolves.toContain(projectName);
    await expect(testId(page, 'stage-timeline').locator('li').count()).resolves.toBe(6);

    await choose(page, 'assignee', DEMO.users.engineerA.name);
    await testId(page, 'due-date').fill('2030-06-30');
    await testId(page, 'save-assignment').click();
    await testId(page, 'stage-design_basis')
      .filter({ hasText: DEMO.users.engineerA.name })
      .waitFor({ timeout: 20_000 });
    await expect(testId(page, 'stage-design_basis').textContent()).resolves.toContain('Due 30 Jun');
    await shot(page, '2-stage-assigned');
  });

  it('the engineer starts the stage, uploads a PDF with visible progress, and submits it', async () => {
    const page = engineer.page;
    await signIn(page, `${projectUrl}?stage=design_basis`, DEMO.users.engineerA);
    await testId(page, 'stage-panel').waitFor({ timeout: 20_000 });
    await testId(page, 'action-start').click();
    await expectState(page, 'In progress');

    await testId(page, 'file-input').setInputFiles(writePdf(tmp));
    const version = testId(page, 'deliverable-version').first();
    await version.waitFor({ timeout: 20_000 });
    await expect(testId(page, 'deliverable-group').first().textContent()).resolves.toContain('design-basis-report.pdf');
    await expect(version.textContent()).resolves.toMatch(/v1/);
    // The download link streams the same bytes back.
    const href = await version.locator('[data-testid="download"]').getAttribute('href');
    const status = await page.evaluate(async (url) => (await fetch(url!)).status, href);
    expect(status).toBe(200);
    await shot(page, '3-deliverable-uploaded');

    await testId(page, 'action-submit').click();
    await expectState(page, 'Under review');
  });

  it('the principal returns the stage, only once a comment says what to change', async () => {
    const page = principal.page;
    await openStage(page);
    await expectState(page, 'Under review');
    await testId(page, 'action-return').click();
    await testId(page, 'action-confirm').click();
    await page.locator('mat-error').filter({ hasText: 'Say what needs changing.' }).waitFor();
    await testId(page, 'action-text').fill(
      'State the wind speed basis and the importance factor for the retail floor.',
    );
    await shot(page, '4-return-dialog');
    await testId(page, 'action-confirm').click();
    await expectState(page, 'Returned');
    await testId(page, 'comment').filter({ hasText: 'importance factor' }).waitFor({ timeout: 20_000 });
  });

  it('the engineer sees the comment and submits again', async () => {
    const page = engineer.page;
    await openStage(page);
    await expectState(page, 'Returned');
    await testId(page, 'comment').filter({ hasText: 'importance factor' }).waitFor({ timeout: 20_000 });
    await testId(page, 'action-submit').click();
    await expectState(page, 'Under review');
  });

  it('the principal approves it, and the activity log tells the story', async () => {
    const page = principal.page;
    await openStage(page);
    await testId(page, 'action-approve').click();
    await testId(page, 'confirm').click();
    await expectState(page, 'Approved');
    // The panel stays on the stage just approved.
    await expect(testId(page, 'stage-panel').locator('h2').textContent()).resolves.toContain('Design basis');
    await testId(page, 'activity-entry').first().waitFor({ timeout: 20_000 });
    const log = (await testId(page, 'activity').textContent()) ?? '';
    expect(log).toMatch(/approved/i);
    expect(log).toMatch(/returned/i);
    await shot(page, '5-stage-approved');
  });

  it('the development outbox shows the submitted, returned and approved notices', async () => {
    const page = principal.page;
    await testId(page, 'nav-outbox').click();
    await page.waitForURL(/\/dev\/outbox$/);
    const subjects = async () =>
      (await testId(page, 'outbox-item').locator('.subject').allTextContents()).filter((s) => s.includes(projectName));
    const expected = [
      `${projectName}: Design basis is ready for your review`,
      `${projectName}: Design basis was returned with comments`,
      `${projectName}: Design basis is approved`,
    ];
    const allThere = async () => {
      const seen = await subjects();
      return expected.every((s) => seen.includes(s)) && seen.filter((s) => s === expected[0]).length === 2;
    };
    // Notices go out through the job queue (the stage was submitted twice, so four mails in all);
    // poll until every kind has arrived.
    for (let i = 0; i < 30 && !(await allThere()); i++) {
      await page.waitForTimeout(1000);
      await testId(page, 'outbox-refresh').click();
      await testId(page, 'outbox-list').or(page.getByText('No mail yet')).waitFor();
    }
    const mine = await subjects();
    expect(mine).toEqual(expect.arrayContaining(expected));
    expect(mine.filter((s) => s === expected[0])).toHaveLength(2);
    // The returned notice carries the comment, and its HTML sits in a sandboxed frame.
    await testId(page, 'outbox-item')
      .filter({ hasText: 'was returned with comments' })
      .filter({ hasText: projectName })
      .first()
      .click();
    await testId(page, 'outbox-text').filter({ hasText: 'importance factor' }).waitFor({ timeout: 10_000 });
    await testId(page, 'outbox-message').filter({ hasText: 'was returned with comments' }).waitFor();
    await expect(testId(page, 'outbox-html').getAttribute('sandbox')).resolves.toBe('');
    await shot(page, '6-outbox');
  });

  it('asked for nothing outside loopback and logged no errors', () => {
    expect(principal.outside).toEqual([]);
    expect(engineer.outside).toEqual([]);
    expect(principal.consoleErrors).toEqual([]);
    expect(engineer.consoleErrors).toEqual([]);
  });
});
