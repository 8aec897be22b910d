import path from 'node:path';
import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// The principal's way in, by keyboard alone: no click, no mouse event anywhere in this file. Every
// element the Tab key lands on must show a focus ring of at least 3 px (WCAG 2.2, 2.4.13).

type Browser = Awaited<ReturnType<typeof openBrowser>>;

interface Focused {
  tag: string;
  text: string;
  testId: string | null;
  href: string | null;
  ring: number;
}

const focused = (page: Page): Promise<Focused> =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    const style = el ? getComputedStyle(el) : null;
    const ring = style && style.outlineStyle !== 'none' ? parseFloat(style.outlineWidth) : 0;
    // A field inside a Material form field shows focus on the field's outline instead (3 px, see styles.scss).
    const field = el?.closest('.mat-mdc-form-field.mat-focused') ? 3 : 0;
    return {
      tag: el?.tagName ?? '',
      text: (el?.textContent ?? '').trim().slice(0, 60),
      testId: el?.getAttribute('data-testid') ?? null,
      href: el?.getAttribute('href') ?? null,
      ring: Math.max(ring, field),
    };
  });

/** Presses Tab until `want` holds; returns how many presses it took and every stop on the way. */
async function tabTo(
  page: Page,
  want: (f: Focused) => boolean,
  max = 40,
): Promise<{ presses: number; stops: Focused[] }> {
  const stops: Focused[] = [];
  for (let i = 1; i <= max; i++) {
    await page.keyboard.press('Tab');
    const f = await focused(page);
    stops.push(f);
    if (want(f)) return { presses: i, stops };
  }
  throw new Error(`not reached in ${max} Tab presses; stops: ${stops.map((s) => s.testId ?? s.text).join(' | ')}`);
}

describe('the principal by keyboard alone', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    await page.setViewportSize({ width: 1440, height: 900 });
  });
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
});
