import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_DRAWINGS } from '../../seeds/demo-drawings';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, pageApi as api, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// Launching Chromium and signing in share the machine with other runs: the setup gets a wider
// budget than a single step (not an assertion on speed).
const SETUP_BUDGET_MS = 180_000;

// Each role's main flow by keyboard alone: no click, no mouse event anywhere in this file. Every
// element the Tab key lands on must show a focus ring of at least 3 px with at least 3:1 contrast
// against the ground it is drawn on (WCAG 2.2, 2.4.13 Focus Appearance).

type Browser = Awaited<ReturnType<typeof openBrowser>>;

interface Focused {
  tag: string;
  text: string;
  testId: string | null;
  href: string | null;
  /** The data-testid of the nearest marked ancestor (the table or panel the element sits in). */
  within: string | null;
  ring: number;
  /**
   * Contrast of the ring against the ground it is drawn on (what those pixels were before focus),
   * as WCAG 2.2 defines contrast ratio; 2.4.13 asks for at least 3:1.
   */
  contrast: number;
}

const focused = (page: Page): Promise<Focused> =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    const style = el ? getComputedStyle(el) : null;
    const rgb = (css: string): [number, number, number, number] | null => {
      const n = css.match(/[\d.]+/g)?.map(Number);
      if (!n || n.length < 3) return null;
      // rgb(0-255 …) or color(srgb 0-1 …)
      const scale = css.startsWith('color(') ? 255 : 1;
      return [n[0] * scale, n[1] * scale, n[2] * scale, n.length > 3 ? n[3] : 1];
    };
    // WCAG 2.2 relative luminance and contrast ratio (Understanding SC 1.4.3, definitions).
    const luminance = ([r, g, b]: number[]) => {
      const lin = (c: number) => {
        const v = c / 255;
        return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
      };
      return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
    };
    const ground = (from: Element | null): number[] => {
      for (let e = from; e; e = e.parentElement) {
        const c = rgb(getComputedStyle(e).backgroundColor);
        if (c && c[3] > 0.5) return c;
      }
      return [255, 255, 255];
    };
    let ring = 0;
    let colour: number[] | null = null;
    let under: number[] = [255, 255, 255];
    if (el && style && style.outlineStyle !== 'none' && parseFloat(style.outlineWidth) > 0) {
      ring = parseFloat(style.outlineWidth);
      colour = rgb(style.outlineColor);
      // A ring drawn inside the element lies on its own ground; one outside, on its parent's.
      under = ground(parseFloat(style.outlineOffset) < 0 ? el : el.parentElement);
    }
    // A field inside a Material form field shows focus on the field's outline instead (3 px, see styles.scss).
    const field = el?.closest('.mat-mdc-form-field.mat-focused');
    const edge = field?.querySelector('.mdc-notched-outline__leading');
    if (field && edge) {
      const e = getComputedStyle(edge);
      ring = Math.max(ring, parseFloat(e.borderTopWidth));
      colour = rgb(e.borderTopColor);
      under = ground(field.parentElement);
    }
    const [a, b] = colour ? [luminance(colour), luminance(under)] : [0, 0];
    const contrast = colour ? (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05) : 0;
    return {
      tag: el?.tagName ?? '',
      text: (el?.textContent ?? '').trim().slice(0, 60),
      testId: el?.getAttribute('data-testid') ?? null,
      href: el?.getAttribute('href') ?? null,
      within: el?.parentElement?.closest('[data-testid]')?.getAttribute('data-testid') ?? null,
      ring,
      contrast: Math.round(contrast * 100) / 100,
    };
  });

/** Presses Tab until `want` holds; returns how many presses it took and every stop on the way. */
async function tabTo(
  page: Page,
  want: (f: Focused) => boolean,
  max = 40,
  key: 'Tab' | 'Shift+Tab' = 'Tab',
): Promise<{ presses: number; stops: Focused[] }> {
  const stops: Focused[] = [];
  for (let i = 1; i <= max; i++) {
    await page.keyboard.press(key);
    const f = await focused(page);
    stops.push(f);
    if (want(f)) return { presses: i, stops };
  }
  throw new Error(`not reached in ${max} Tab presses; stops: ${stops.map((s) => s.testId ?? s.text).join(' | ')}`);
}

/** Signs in from the sign-in page with Tab, typing and Enter only. */
async function signInByKeyboard(page: Page, base: string, user: { email: string; name: string }): Promise<void> {
  await page.goto(`${base}/sign-in`);
  await page.locator('[data-testid="sign-in"]').waitFor({ timeout: 20_000 });
  await tabTo(page, (f) => f.testId === 'sign-in');
  await page.keyboard.press('Enter');
  await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
  await page.waitForFunction(() => document.activeElement?.id === 'email', null, { timeout: 20_000 });
  await page.keyboard.type(user.email);
  await page.keyboard.press('Tab');
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.locator('[data-testid="user-name"]').filter({ hasText: user.name }).waitFor({ timeout: 60_000 });
}

/** From wherever focus is, back up to the main navigation and follow one of its links with Enter. */
async function navigateByKeyboard(page: Page, id: string, ready: string): Promise<Focused[]> {
  const { stops } = await tabTo(page, (f) => f.testId === `nav-${id}`, 80, 'Shift+Tab');
  await page.keyboard.press('Enter');
  await page.locator(ready).first().waitFor({ timeout: 20_000 });
  await page.waitForLoadState('networkidle');
  return stops;
}

/** Stops whose focus ring is thinner than 3 px or has less than 3:1 contrast with its ground. */
const unringed = (stops: Focused[]) => stops.filter((s) => s.ring < 3 || s.contrast < 3);

/** A one-page PDF, enough for the register's upload check (it reads the header, not the drawing). */
function writePdf(name: string): string {
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
  for (const o of offsets) body += `${String(o).padStart(10, '0')} 00000 n \n`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  const file = path.join(mkdtempSync(path.join(tmpdir(), 'trabeate-kbd-')), name);
  writeFileSync(file, body);
  return file;
}

describe('the principal by keyboard alone', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    await page.setViewportSize({ width: 1440, height: 900 });
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it('signs in with the keyboard', async () => {
    await page.goto(`${base}/sign-in`);
    await page.locator('[data-testid="sign-in"]').waitFor({ timeout: 20_000 });
    await tabTo(page, (f) => f.testId === 'sign-in');
    await page.keyboard.press('Enter');
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    // The sign-in page puts the cursor in the e-mail field itself.
    await page.waitForFunction(() => document.activeElement?.id === 'email', null, { timeout: 20_000 });
    await page.keyboard.type(DEMO.users.principal.email);
    await page.keyboard.press('Tab');
    await page.keyboard.type(DEMO_PASSWORD);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="user-name"]').filter({ hasText: DEMO.users.principal.name }).waitFor({
      timeout: 20_000,
    });
  });

  it('skips to the page with the first Tab, and reaches the first project in a few more, every stop ringed', async () => {
    await page.goto(`${base}/projects`);
    await page.locator('[data-testid="projects-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    await page.keyboard.press('Tab');
    const skip = await focused(page);
    expect(skip).toMatchObject({ testId: 'skip-link', text: 'Skip to main content' });
    expect(skip.ring).toBeGreaterThanOrEqual(3);
    await page.keyboard.press('Enter');
    await expect(page.evaluate(() => document.activeElement?.id)).resolves.toBe('main');

    const { presses, stops } = await tabTo(page, (f) => /^\/projects\/[0-9a-f-]{36}$/.test(f.href ?? ''));
    // New project, search, client, status, four sort headers, then the first project's link.
    expect(presses).toBeLessThanOrEqual(12);
    expect(stops.filter((s) => s.ring < 3)).toEqual([]);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-projects-focus.png') });
  });

  it('opens the project and a stage with Enter, focus ringed all the way', async () => {
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}/, { timeout: 20_000 });
    await page.locator('[data-testid="stage-timeline"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const { stops } = await tabTo(page, (f) => f.testId === 'stage-stairs', 40);
    expect(stops.filter((s) => s.ring < 3)).toEqual([]);
    await page.keyboard.press('Enter');
    await page.waitForURL(/stage=stairs/, { timeout: 20_000 });
    await expect(page.locator('[data-testid="stage-panel"] h2').textContent()).resolves.toContain('Stairs');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-stage.png') });
    expect(browser.outside).toEqual([]);
  });

  it('creates a project: a failed save puts focus on the first field in error and says how many, then it saves', async () => {
    await page.goto(`${base}/projects/new`);
    await page.locator('[data-testid="project-form"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const toSave = await tabTo(page, (f) => f.testId === 'save-project', 80);
    await page.keyboard.press('Enter');
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'field-reference', null, {
      timeout: 20_000,
    });
    // Reference, name, client and the three unit rates are empty: the count goes to screen
    // readers through the live region.
    await page
      .locator('.cdk-live-announcer-element')
      .filter({ hasText: '6 fields need attention.' })
      .waitFor({ state: 'attached', timeout: 10_000 });
    const reference = `E2E-KBN-${Date.now().toString(36).toUpperCase()}`;
    await page.keyboard.type(reference);
    await page.keyboard.press('Tab');
    await page.keyboard.type(`Marrowgate Depot ${reference}`);
    await page.keyboard.press('Tab');
    expect((await focused(page)).testId).toBe('field-clientOrganisationId');
    // On a closed select the arrow keys choose the next option.
    await page.keyboard.press('ArrowDown');
    // The firm's own unit rates, typed in (no starting values).
    for (const [field, value] of [
      ['field-concretePerM3', '135'],
      ['field-steelPerKg', '1.15'],
      ['field-formworkPerM2', '24'],
    ]) {
      await tabTo(page, (f) => f.testId === field, 40);
      await page.keyboard.type(value);
    }
    const toSaveAgain = await tabTo(page, (f) => f.testId === 'save-project', 80);
    expect(unringed([...toSave.stops, ...toSaveAgain.stops])).toEqual([]);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/, { timeout: 20_000 });
    await page
      .locator('h1')
      .filter({ hasText: `Marrowgate Depot ${reference}` })
      .waitFor({ timeout: 20_000 });
    expect(browser.outside).toEqual([]);
  });
});

describe('the client by keyboard alone', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInByKeyboard(page, base, DEMO.users.fenwickContact);
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it('opens a project from the list with Enter', async () => {
    await page.locator('[data-testid="projects-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const { stops } = await tabTo(page, (f) => /^\/projects\/[0-9a-f-]{36}$/.test(f.href ?? ''));
    expect(unringed(stops)).toEqual([]);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="stage-timeline"]').waitFor({ timeout: 20_000 });
  });

  it('opens an issued drawing from the register and reaches its download', async () => {
    const back = await navigateByKeyboard(
      page,
      'drawings',
      '[data-testid="drawings-table"], [data-testid="project-choice"]',
    );
    // With no project named the register opens on the first by reference (the choice shows only
    // with more than one); other browser tests add projects (E2E-…) with this client that sort
    // first: then the demo project's link.
    const choice = page.locator('[data-testid="project-choice"]');
    if ((await choice.count()) > 0 && !(await choice.textContent())?.includes('Kestrel Yard')) {
      await page.goto(`${base}/drawings?project=${DEMO.projects.kestrel.id}`);
    }
    await page
      .locator('[data-testid="drawings-table"]')
      .getByText(DEMO_DRAWINGS.columns.number)
      .first()
      .waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const { stops } = await tabTo(
      page,
      (f) => f.within === 'drawings-table' && f.text === DEMO_DRAWINGS.columns.number,
      60,
    );
    expect(unringed([...back, ...stops])).toEqual([]);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="drawing-detail"]').waitFor({ timeout: 20_000 });
    const toFile = await tabTo(page, (f) => f.testId === 'file-download', 60);
    expect(unringed(toFile.stops)).toEqual([]);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-client-drawing.png') });
  });

  it('asked for nothing outside loopback', () => {
    expect(browser.outside).toEqual([]);
  });
});

// The demo's invoices are Alder Lane's, so its client contact (Harbourlight) takes this part.
describe('a client by keyboard alone: from the Fees page to Pay', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInByKeyboard(page, base, DEMO.users.harbourlightContact);
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it("reaches an invoice's PDF and then its Pay button, every stop ringed", async () => {
    await page.locator('[data-testid="projects-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const toNav = await tabTo(page, (f) => f.testId === 'nav-fees', 40);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="invoices-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const pdf = await tabTo(page, (f) => /\/invoices\/[0-9a-f-]{36}\/pdf$/.test(f.href ?? ''), 60);
    const pay = await tabTo(page, (f) => f.testId === 'pay', 60);
    expect(pay.stops.at(-1)?.text).toMatch(/^Pay /);
    expect(unringed([...toNav.stops, ...pdf.stops, ...pay.stops])).toEqual([]);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-client-pay.png') });
    expect(browser.outside).toEqual([]);
  });
});

describe('the register by keyboard alone: an engineer registers a revision, the principal approves it', () => {
  const base = testEnv('E2E_BASE_URL');
  let engineer: Browser;
  let principal: Browser;
  const drawing = DEMO_DRAWINGS.columns.number;

  beforeAll(async () => {
    engineer = await openBrowser();
    principal = await openBrowser();
    for (const b of [engineer, principal]) await b.page.setViewportSize({ width: 1440, height: 900 });
    await signInByKeyboard(engineer.page, base, DEMO.users.engineerA);
  }, SETUP_BUDGET_MS);
  afterAll(async () => {
    await engineer?.close();
    await principal?.close();
  });

  /** Opens the drawing from the register (navigation, then its number in the table) by keyboard. */
  async function openDrawing(page: Page): Promise<Focused[]> {
    // The register of the demo project, from its link: with no project named, the register opens
    // on the first by reference, and other browser tests add projects (E2E-…) that sort first.
    await page.goto(`${base}/drawings?project=${DEMO.projects.kestrel.id}`);
    await page.locator('[data-testid="drawings-table"]').getByText(drawing).first().waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const { stops } = await tabTo(page, (f) => f.within === 'drawings-table' && f.text === drawing, 60);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="drawing-detail"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    return stops;
  }

  it('the engineer registers the next revision and uploads its PDF', async () => {
    const page = engineer.page;
    const stops = await openDrawing(page);
    const code = (await page.locator('[data-testid="proposed-code"]').textContent({ timeout: 20_000 }))!.trim();
    const toSubmit = await tabTo(page, (f) => f.testId === 'register-revision', 60);
    expect(unringed([...stops, ...toSubmit.stops])).toEqual([]);
    // Waiting for the chooser turns on Chromium's chooser interception, a round trip of its own: a
    // key pressed straight after it can open the dialog before interception is on, and the event
    // never comes (seen once in CI). So the wait starts here, well before the key.
    const chooserOpens = page.waitForEvent('filechooser', { timeout: 60_000 });
    chooserOpens.catch(() => undefined); // a failure before the key is reported by its own step
    await page.keyboard.press('Enter');
    // the form gives way to the new draft, and focus moves on to its PDF upload
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'upload-pdf', null, {
      timeout: 20_000,
    });
    expect((await focused(page)).ring).toBeGreaterThanOrEqual(3);
    await page.keyboard.press('Space');
    const chooser = await chooserOpens;
    await chooser.setFiles(writePdf(`${drawing}-${code}.pdf`));
    await page
      .locator('[data-testid="file-download"]')
      .filter({ hasText: `${drawing}-${code}.pdf` })
      .waitFor({ timeout: 20_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-engineer-revision.png') });
  });

  it(
    'the principal checks and approves it',
    async () => {
      const page = principal.page;
      await signInByKeyboard(page, base, DEMO.users.principal);
      const stops = await openDrawing(page);
      const check = await tabTo(page, (f) => f.testId === 'revision-check', 60);
      await page.keyboard.press('Enter');
      await page.locator('[data-testid="revision-approve"]').waitFor({ timeout: 20_000 });
      const approve = await tabTo(page, (f) => f.testId === 'revision-approve', 60, 'Shift+Tab').catch(() =>
        tabTo(page, (f) => f.testId === 'revision-approve', 60),
      );
      expect(unringed([...stops, ...check.stops, ...approve.stops])).toEqual([]);
      await page.keyboard.press('Enter');
      await page
        .locator('[data-testid="revision-history"] li')
        .first()
        .locator('tb-state-marker[data-state="approved"]')
        .waitFor({ timeout: 20_000 });
      await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-principal-approved.png') });
      expect(engineer.outside).toEqual([]);
      expect(principal.outside).toEqual([]);
    },
    SETUP_BUDGET_MS,
  );
});

describe('fees by keyboard alone: the principal issues a draft invoice', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInByKeyboard(page, base, DEMO.users.principal);
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it("opens the demo draft (Alder Lane's) from the invoice list and issues it", async () => {
    await page.locator('[data-testid="projects-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const toNav = await tabTo(page, (f) => f.testId === 'nav-fees', 40);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="invoices-table"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const toDraft = await tabTo(page, (f) => f.within === 'invoices-table' && f.text === 'Draft', 80);
    await page.keyboard.press('Enter');
    const panel = page.locator('[data-testid="invoice-panel"]');
    await panel.waitFor({ timeout: 20_000 });
    const toIssue = await tabTo(page, (f) => f.testId === 'issue-invoice', 80);
    expect(unringed([...toNav.stops, ...toDraft.stops, ...toIssue.stops])).toEqual([]);
    await page.keyboard.press('Enter');
    await panel.locator('[data-testid="invoice-state"]', { hasText: 'Awaiting payment' }).waitFor({ timeout: 20_000 });
    await expect(panel.locator('h3').textContent()).resolves.toMatch(/INV-\d{4}-\d{4}/);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-principal-issued.png') });
    expect(browser.outside).toEqual([]);
  });
});

describe('an engineer by keyboard alone: comments on a stage and submits it for review', () => {
  const base = testEnv('E2E_BASE_URL');
  const reference = `E2E-KB-${Date.now().toString(36).toUpperCase()}`;
  const note = 'Wind basis taken from the site survey; importance class II.';
  let principal: Browser;
  let engineer: Browser;
  let page: Page;
  let projectId = '';

  beforeAll(async () => {
    // The principal sets up a project of this file's own through the API (so no other browser
    // test's demo stages change), with the demo engineer on its design basis stage.
    principal = await openBrowser();
    await signInByKeyboard(principal.page, base, DEMO.users.principal);
    const created = await api(principal.page, 'POST', '/api/projects', {
      reference,
      name: `Quillon Court ${reference}`,
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 4,
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
    const assigned = await api(principal.page, 'PATCH', `/api/projects/${projectId}/stages/design_basis`, {
      assigneeId: DEMO.users.engineerA.id,
    });
    expect(assigned.status).toBe(200);

    engineer = await openBrowser();
    page = engineer.page;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInByKeyboard(page, base, DEMO.users.engineerA);
  }, SETUP_BUDGET_MS);
  afterAll(async () => {
    await principal?.close();
    await engineer?.close();
  });

  it('opens the stage with Enter and starts work', async () => {
    await page.goto(`${base}/projects/${projectId}`);
    await page.locator('[data-testid="stage-timeline"]').waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const toStage = await tabTo(page, (f) => f.testId === 'stage-design_basis', 40);
    await page.keyboard.press('Enter');
    await page.waitForURL(/stage=design_basis/, { timeout: 20_000 });
    const toStart = await tabTo(page, (f) => f.testId === 'action-start', 40);
    expect(unringed([...toStage.stops, ...toStart.stops])).toEqual([]);
    await page.keyboard.press('Enter');
    await page
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'In progress' })
      .waitFor({ timeout: 20_000 });
  });

  it('writes a comment, posts it with Enter on the button, and submits the stage for review', async () => {
    await tabTo(page, (f) => f.testId === 'comment-text', 60);
    await page.keyboard.type(note);
    const toPost = await tabTo(page, (f) => f.testId === 'comment-post', 10);
    expect(unringed(toPost.stops)).toEqual([]);
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="comment"]').filter({ hasText: note }).waitFor({ timeout: 20_000 });

    // back up from the comments to the stage's actions
    const toSubmit = await tabTo(page, (f) => f.testId === 'action-submit', 60, 'Shift+Tab');
    expect(unringed(toSubmit.stops)).toEqual([]);
    await page.keyboard.press('Enter');
    await page
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'Under review' })
      .waitFor({ timeout: 20_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-engineer-submitted.png') });
    expect(engineer.outside).toEqual([]);
  });

  it('the principal returns the stage with a comment, by keyboard, the dialog opening on its field', async () => {
    const p = principal.page;
    await p.setViewportSize({ width: 1440, height: 900 });
    await p.goto(`${base}/projects/${projectId}`);
    await p.locator('[data-testid="stage-timeline"]').waitFor({ timeout: 20_000 });
    await p.waitForLoadState('networkidle');
    const toStage = await tabTo(p, (f) => f.testId === 'stage-design_basis', 40);
    await p.keyboard.press('Enter');
    await p
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'Under review' })
      .waitFor({ timeout: 20_000 });
    const toReturn = await tabTo(p, (f) => f.testId === 'action-return', 60);
    await p.keyboard.press('Enter');
    // The dialog puts focus in its comment field, so typing goes straight in.
    await p.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'action-text', null, {
      timeout: 20_000,
    });
    await p.keyboard.type('Give the wind speed basis for the roof plant.');
    const toConfirm = await tabTo(p, (f) => f.testId === 'action-confirm', 10);
    expect(unringed([...toStage.stops, ...toReturn.stops, ...toConfirm.stops])).toEqual([]);
    await p.keyboard.press('Enter');
    await p
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'Returned' })
      .waitFor({ timeout: 20_000 });
  });

  it('after the engineer submits again, the principal approves it by keyboard through the confirmation', async () => {
    const again = await api(page, 'POST', `/api/projects/${projectId}/stages/design_basis/transitions`, {
      action: 'submit',
    });
    expect(again.status).toBe(200);
    const p = principal.page;
    await p.reload();
    await p
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'Under review' })
      .waitFor({ timeout: 20_000 });
    await p.waitForLoadState('networkidle');
    const toApprove = await tabTo(p, (f) => f.testId === 'action-approve', 60);
    await p.keyboard.press('Enter');
    await p.locator('[data-testid="confirm"]').waitFor({ timeout: 20_000 });
    const toConfirm = await tabTo(p, (f) => f.testId === 'confirm', 10);
    expect(unringed([...toApprove.stops, ...toConfirm.stops])).toEqual([]);
    await p.keyboard.press('Enter');
    await p
      .locator('[data-testid="stage-panel"] [data-testid="stage-state"]')
      .filter({ hasText: 'Approved' })
      .waitFor({ timeout: 20_000 });
    await p.screenshot({ path: path.join(SCREENSHOTS, 'keyboard-principal-approved.png') });
    expect(principal.outside).toEqual([]);
  });
});
