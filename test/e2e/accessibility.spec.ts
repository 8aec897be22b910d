import path from 'node:path';
import type { Page } from 'playwright-core';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';
import { ROLES, signIn, visit } from './main-pages';

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
