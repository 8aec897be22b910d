import path from 'node:path';
import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// Every existing main page, for each role, at a desktop and a phone size: axe-core (from npm,
// injected into the page; nothing downloaded) must find no serious or critical violation, and the
// page must not scroll sideways. Screenshots of both sizes are saved by the run.

type Browser = Awaited<ReturnType<typeof openBrowser>>;
const AXE = require.resolve('axe-core/axe.min.js');
const SIZES = [
  { name: 'desktop', width: 1440, height: 900 },
  { name: 'phone', width: 390, height: 844 },
] as const;
const kestrel = `/projects/${DEMO.projects.kestrel.id}`;

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

async function signIn(page: Page, base: string, user: { email: string; name: string }): Promise<void> {
  await page.goto(`${base}/projects`);
  await page.locator('[data-testid="sign-in"]').click({ timeout: 20_000 });
  await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
  await page.fill('input#email', user.email);
  await page.fill('input#password', DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.locator('[data-testid="user-name"]').filter({ hasText: user.name }).waitFor({ timeout: 20_000 });
}

/** Opens a page and waits until it has drawn its content (not a spinner). */
async function visit(page: Page, url: string, ready: string): Promise<void> {
  await page.goto(url);
  await page.locator(ready).first().waitFor({ state: 'visible', timeout: 20_000 });
  await page.waitForLoadState('networkidle');
  // Let Material's entry animations finish so colours are measured at rest.
  await page.waitForTimeout(300);
}

const ROLES: Array<{
  role: string;
  user: { email: string; name: string } | null;
  pages: Array<{ name: string; url: string; ready: string }>;
}> = [
  {
    role: 'principal',
    user: DEMO.users.principal,
    pages: [
      { name: 'projects', url: '/projects', ready: '[data-testid="projects-table"]' },
      { name: 'project', url: kestrel, ready: '[data-testid="stage-panel"]' },
      { name: 'project-form', url: '/projects/new', ready: '[data-testid="project-form"]' },
      { name: 'project-edit', url: `${kestrel}/edit`, ready: '[data-testid="project-form"]' },
      { name: 'people', url: '/people', ready: 'main h1' },
      { name: 'outbox', url: '/dev/outbox', ready: 'main h1' },
      { name: 'status', url: '/status', ready: '[data-testid="status-database"]' },
    ],
  },
  {
    role: 'engineer',
    user: DEMO.users.engineerA,
    pages: [
      { name: 'projects', url: '/projects', ready: '[data-testid="projects-table"]' },
      { name: 'project', url: kestrel, ready: '[data-testid="stage-panel"]' },
      { name: 'status', url: '/status', ready: '[data-testid="status-database"]' },
    ],
  },
  {
    role: 'client',
    user: DEMO.users.fenwickContact,
    pages: [
      { name: 'projects', url: '/projects', ready: '[data-testid="projects-table"]' },
      { name: 'project', url: kestrel, ready: '[data-testid="stage-panel"]' },
    ],
  },
  {
    role: 'signed-out',
    user: null,
    pages: [
      { name: 'sign-in', url: '/sign-in', ready: '[data-testid="sign-in"]' },
      { name: 'status', url: '/status', ready: '[data-testid="status-database"]' },
    ],
  },
];

describe.each(ROLES)('accessibility for the $role', ({ role, user, pages }) => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;

  beforeAll(async () => {
    browser = await openBrowser({ bypassCSP: true });
    if (user) await signIn(browser.page, base, user);
  });
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
