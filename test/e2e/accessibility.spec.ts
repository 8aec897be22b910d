import path from 'node:path';
import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { openBrowser, pageApi as api, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';
import { kestrel, ROLES, signIn, visit } from './main-pages';

// Launching Chromium and signing in share the machine with other runs: the setup gets a wider
// budget than a single step (not an assertion on speed).
const SETUP_BUDGET_MS = 180_000;

// Every existing main page, for each role, at a desktop and a phone size: axe-core (from npm,
// injected into the page; nothing downloaded) must find no serious or critical violation, and the
// page must not scroll sideways. Screenshots of both sizes are saved by the run.

type Browser = Awaited<ReturnType<typeof openBrowser>>;
const AXE = require.resolve('axe-core/axe.min.js');
const SIZES = [
  { name: 'desktop', width: 1440, height: 900 },
  { name: 'phone', width: 390, height: 844 },
] as const;
interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

async function serious(page: Page): Promise<string[]> {
  await page.addScriptTag({ path: AXE });
  const violations: Violation[] = await page.evaluate(async () => {
    const axe = (
      window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: Violation[] }> } }
    ).axe;
    const r = await axe.run(document, {
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'] },
    });
    return r.violations;
  });
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id}: ${v.help} at ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}

describe.each(ROLES)('accessibility for the $role', ({ role, user, pages }) => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;

  beforeAll(async () => {
    browser = await openBrowser({ bypassCSP: true });
    if (user) await signIn(browser.page, base, user);
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it.each(pages)(
    '$name has no serious or critical axe violation and no sideways scroll, desktop and phone',
    async (p) => {
      const page = browser.page;
      const found: Record<string, string[]> = {};
      const overflow: Record<string, number> = {};
      for (const size of SIZES) {
        await page.setViewportSize({ width: size.width, height: size.height });
        await visit(page, `${base}${p.url}`, p.ready);
        found[size.name] = await serious(page);
        const wide = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        if (wide > 0) overflow[size.name] = wide;
        await page.screenshot({
          path: path.join(SCREENSHOTS, `a11y-${role}-${p.name}-${size.name}.png`),
          fullPage: true,
        });
      }
      expect(found).toEqual({ desktop: [], phone: [] });
      expect(overflow).toEqual({});
      expect(browser.outside).toEqual([]);
    },
  );
});

// The dialogs, open on their page, at both sizes: a dialog is a page of its own to a screen reader.
// The stage dialogs are tried on a project of this file's own, so no demo stage changes.
describe('accessibility of the dialogs', () => {
  const base = testEnv('E2E_BASE_URL');
  const reference = `E2E-AX-${Date.now().toString(36).toUpperCase()}`;
  let principal: Browser;
  let engineer: Browser;
  let projectId = '';

  beforeAll(async () => {
    principal = await openBrowser({ bypassCSP: true });
    engineer = await openBrowser({ bypassCSP: true });
    await signIn(principal.page, base, DEMO.users.principal);
    await signIn(engineer.page, base, DEMO.users.engineerA);
    const created = await api(principal.page, 'POST', '/api/projects', {
      reference,
      name: `Sallow Yard ${reference}`,
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 3,
      storeyHeightM: 3,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1.5,
        bearingPressureKPa: 150,
        foundingDepthM: 1.2,
      },
    });
    expect(created.status).toBe(201);
    projectId = created.body.id;
    const stage = `/api/projects/${projectId}/stages/design_basis`;
    expect((await api(principal.page, 'PATCH', stage, { assigneeId: DEMO.users.engineerA.id })).status).toBe(200);
    expect((await api(engineer.page, 'POST', `${stage}/transitions`, { action: 'start' })).status).toBe(200);
    expect((await api(engineer.page, 'POST', `${stage}/transitions`, { action: 'submit' })).status).toBe(200);
  }, SETUP_BUDGET_MS * 2);
  afterAll(async () => {
    await principal?.close();
    await engineer?.close();
  });

  /** Opens a dialog with `open` at each size, runs axe on the page with it open, and closes it. */
  async function eachSize(b: Browser, name: string, url: string, ready: string, open: (page: Page) => Promise<void>) {
    const page = b.page;
    const found: Record<string, string[]> = {};
    for (const size of SIZES) {
      await page.setViewportSize({ width: size.width, height: size.height });
      await visit(page, `${base}${url}`, ready);
      await open(page);
      await page.locator('mat-dialog-container').waitFor({ timeout: 20_000 });
      await page.waitForTimeout(300); // the dialog's entry animation
      found[size.name] = await serious(page);
      await page.screenshot({ path: path.join(SCREENSHOTS, `a11y-dialog-${name}-${size.name}.png`) });
      // The first button of the action row leaves without a change ("Cancel", "Keep as is").
      await page.locator('mat-dialog-container mat-dialog-actions button').first().click();
      await page.locator('mat-dialog-container').waitFor({ state: 'detached', timeout: 20_000 });
    }
    expect(found).toEqual({ desktop: [], phone: [] });
    expect(b.outside).toEqual([]);
  }

  it('the invitation dialog (People)', () =>
    eachSize(principal, 'invite', '/people', '[data-testid="invite-open"]', (page) =>
      page.locator('[data-testid="invite-open"]').click(),
    ));

  it('the return dialog, with its error showing after an empty send', () =>
    eachSize(
      principal,
      'return',
      `/projects/${projectId}?stage=design_basis`,
      '[data-testid="action-return"]',
      async (page) => {
        await page.locator('[data-testid="action-return"]').click();
        await page.locator('[data-testid="action-confirm"]').click();
        await page.locator('mat-dialog-container mat-error').waitFor({ timeout: 20_000 });
      },
    ));

  it('the approval confirmation', () =>
    eachSize(
      principal,
      'approve',
      `/projects/${projectId}?stage=design_basis`,
      '[data-testid="action-approve"]',
      (page) => page.locator('[data-testid="action-approve"]').click(),
    ));

  it('the scheme submission dialog (Beam framing of the demo project, left as it was)', () =>
    eachSize(engineer, 'submit-scheme', `${kestrel}?stage=beam_framing`, '[data-testid="action-submit"]', (page) =>
      page.locator('[data-testid="action-submit"]').click(),
    ));
});
