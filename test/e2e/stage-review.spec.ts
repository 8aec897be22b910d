import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, pageApi as api, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// From check to invoice, as two people in two browsers: the engineer submits Column layout with a
// scheme whose save holds one error-level check and justifies it; the principal reads the check
// summary and the justification in the review, approves the stage against that version, and
// follows the review to the draft invoice approval offered for the stage's fee share.
//
// The scheme is the demo's scheme B (Kestrel Yard, one column left out, one error-level check),
// copied through the API onto a project of this test's own with its own fee agreement: Kestrel
// Yard's Column layout and fees belong to the fees browser test, which approves that stage.

type Browser = Awaited<ReturnType<typeof openBrowser>>;

describe('stage review from checks to the offered invoice, in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  const reference = `E2E-RV-${Date.now().toString(36).toUpperCase()}`;
  const justification = 'B3 is carried on a deepened transfer beam; the column is resized in Beam framing.';
  let principal: Browser;
  let engineer: Browser;
  let projectId = '';

  const testId = (page: Page, id: string): Locator => page.locator(`[data-testid="${id}"]`);
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: path.join(SCREENSHOTS, `stage-review-${name}.png`), fullPage: true });

  async function signIn(page: Page, url: string, user: { email: string; name: string }): Promise<void> {
    await page.goto(url);
    await testId(page, 'sign-in').click({ timeout: 20_000 });
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', user.email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await testId(page, 'user-name').filter({ hasText: user.name }).waitFor({ timeout: 20_000 });
  }

  const stageState = (page: Page) => testId(page, 'stage-panel').locator('[data-testid="stage-state"]');

  beforeAll(async () => {
    principal = await openBrowser();
    engineer = await openBrowser();
    const page = principal.page;
    await signIn(page, `${base}/projects`, DEMO.users.principal);

    const created = await api(page, 'POST', '/api/projects', {
      reference,
      name: `Tanner's Row ${reference}`,
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 7,
      storeyHeightM: 3.1,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1.5,
        bearingPressureKPa: 180,
        foundingDepthM: 1.5,
      },
    });
    expect(created.status).toBe(201);
    projectId = created.body.id;
    const p = `/api/projects/${projectId}`;
    expect((await api(page, 'PUT', `${p}/members/${DEMO.users.fenwickContact.id}`)).status).toBeLessThan(300);
    expect(
      (await api(page, 'PATCH', `${p}/stages/column_layout`, { assigneeId: DEMO.users.engineerA.id })).status,
    ).toBe(200);
    const agreement = await api(page, 'PUT', `${p}/fee-agreement`, {
      basis: 'lump_sum',
      lumpSumMinor: 3_000_000,
      currency: 'EUR',
      taxRateBp: 2000,
      taxLabel: 'VAT',
      paymentTermsDays: 30,
      billingContactId: DEMO.users.fenwickContact.id,
      stageShares: {
        design_basis: 1000,
        column_layout: 2000,
        beam_framing: 2500,
        slab_panels: 2000,
        stairs: 500,
        foundations: 2000,
      },
    });
    expect(agreement.status).toBe(200);

    // The demo's scheme B, saved by the engineer (schemes are laid out by engineers) as the second
    // version of a new scheme on this project.
    const eng = engineer.page;
    await signIn(eng, `${base}/projects`, DEMO.users.engineerA);
    const source = await api(eng, 'GET', `/api/projects/${DEMO.projects.kestrel.id}/schemes/${DEMO_SCHEMES.fewer.id}`);
    expect(source.status).toBe(200);
    const scheme = await api(eng, 'POST', `${p}/schemes`, { name: 'One column fewer' });
    expect(scheme.status).toBe(201);
    const saved = await api(eng, 'PUT', `${p}/schemes/${scheme.body.id}/document`, {
      baseVersion: 1,
      document: source.body.document,
    });
    expect(saved.status).toBe(200);
    // The scenario's premise, read from what the server stored: one error-level check.
    expect(saved.body.current.checks.errors).toBe(1);
    // Two sign-ins and a dozen API calls: on a loaded shared machine this takes longer than one step's budget.
  }, 180_000);
  afterAll(async () => {
    await principal?.close();
    await engineer?.close();
  });

  it('the engineer submits Column layout with the scheme, justifying its one error-level check', async () => {
    const page = engineer.page;
    await page.goto(`${base}/projects/${projectId}?stage=column_layout`);
    await testId(page, 'stage-panel').waitFor({ timeout: 20_000 });
    await testId(page, 'action-start').click();
    await stageState(page).filter({ hasText: 'In progress' }).waitFor({ timeout: 20_000 });
    await testId(page, 'review-empty').waitFor({ timeout: 20_000 });

    await testId(page, 'action-submit').click();
    const field = testId(page, 'justification-0');
    await field.waitFor({ timeout: 20_000 });
    await expect(testId(page, 'justifications').textContent()).resolves.toContain('column.capacity');

    // Submitting without the reason is stopped in the browser, focus on the field.
    await testId(page, 'submit-confirm').click();
    await testId(page, 'invalid-count').filter({ hasText: '1 field needs attention.' }).waitFor();
    await expect(field.evaluate((el) => el === document.activeElement)).resolves.toBe(true);

    await field.fill(justification);
    await shot(page, '1-submit');
    await testId(page, 'submit-confirm').click();
    await stageState(page).filter({ hasText: 'Under review' }).waitFor({ timeout: 20_000 });
    await testId(page, 'review-justification').filter({ hasText: justification }).waitFor({ timeout: 20_000 });
  });

  it('the principal sees the check summary and the justification, opens the report, registers the plan sheet and approves against the version', async () => {
    const page = principal.page;
    await page.goto(`${base}/projects/${projectId}?stage=column_layout`);
    await testId(page, 'stage-review').waitFor({ timeout: 20_000 });
    await testId(page, 'review-justification').filter({ hasText: justification }).waitFor({ timeout: 20_000 });
    await expect(testId(page, 'review-scheme').textContent()).resolves.toContain('One column fewer, version 2');
    await expect(testId(page, 'review-counts').textContent()).resolves.toContain('1 error(s)');
    await expect(testId(page, 'review-rules').textContent()).resolves.toContain('column.capacity');
    await shot(page, '2-review');

    // from the review: the calculation report of the submitted version, then its plan sheet
    // registered as a draft revision, without leaving the stage
    await testId(page, 'review-outputs-toggle').click();
    await testId(page, 'report-generate').click();
    const open = testId(page, 'report-open');
    await open.waitFor({ timeout: 90_000 });
    const report = await page.request.get(new URL((await open.getAttribute('href'))!, base).toString());
    expect(report.status()).toBe(200);
    expect(report.headers()['content-type']).toBe('application/pdf');
    await testId(page, 'register-title').fill('Column layout, submitted scheme');
    await testId(page, 'register-submit').click();
    await expect(testId(page, 'register-done').textContent({ timeout: 30_000 })).resolves.toMatch(
      /Revision P01 of .+ registered from version 2/,
    );
    await shot(page, '2b-review-outputs');

    await testId(page, 'action-approve').click();
    await testId(page, 'confirm').click();
    await stageState(page).filter({ hasText: 'Approved' }).waitFor({ timeout: 20_000 });
    await testId(page, 'review-decision').filter({ hasText: '(version 2)' }).waitFor({ timeout: 20_000 });
  });

  it('the principal follows the review to the offered draft invoice for the stage share', async () => {
    const page = principal.page;
    // Column layout is 20 % of the 30 000.00 lump sum, plus 20 % VAT: 6 000.00 + 1 200.00.
    const offer = testId(page, 'review-invoice');
    await offer.filter({ hasText: '€7,200.00' }).waitFor({ timeout: 20_000 });
    await expect(offer.textContent()).resolves.toContain('A draft invoice');
    await testId(page, 'review-invoice-link').click();
    await page.waitForURL(new RegExp(`/fees\\?project=${projectId}`), { timeout: 20_000 });
    await testId(page, 'invoices-table').waitFor({ timeout: 20_000 });
    const draft = page.locator('tr[data-invoice]').filter({ hasText: '€7,200.00' });
    await draft.first().waitFor({ timeout: 20_000 });
    await expect(draft.first().textContent()).resolves.toContain('Draft');
    await shot(page, '3-offered-invoice');
    expect(principal.outside).toEqual([]);
    expect(engineer.outside).toEqual([]);
  });
});
