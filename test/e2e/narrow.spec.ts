import path from 'node:path';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';
import { ROLES, signIn, visit } from './main-pages';

// Launching Chromium and signing in share the machine with other runs: the setup gets a wider
// budget than a single step (not an assertion on speed).
const SETUP_BUDGET_MS = 180_000;

// Every main page at 360 × 740 (a small phone held upright), for each role that sees it: the page
// must not scroll sideways, nor any table or card inside it (the plan drawing pans by design).
// Tables turn into stacked rows, cards stack, and long words wrap.

type Browser = Awaited<ReturnType<typeof openBrowser>>;
const NARROW = { width: 360, height: 740 };

describe.each(ROLES)('at 360 px wide, the $role', ({ role, user, pages }) => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Browser;

  beforeAll(async () => {
    browser = await openBrowser();
    await browser.page.setViewportSize(NARROW);
    if (user) await signIn(browser.page, base, user);
  }, SETUP_BUDGET_MS);
  afterAll(() => browser?.close());

  it.each(pages)('$name fits the width without sideways scrolling', async (p) => {
    const page = browser.page;
    await visit(page, `${base}${p.url}`, p.ready);
    const size = await page.evaluate(() => {
      const el = document.scrollingElement ?? document.documentElement;
      // What sticks out, for the failure message: the widest elements past the right edge.
      const past = [...document.querySelectorAll<HTMLElement>('body *')]
        .filter((e) => e.getBoundingClientRect().right > el.clientWidth + 0.5)
        .slice(0, 5)
        .map((e) => `${e.tagName.toLowerCase()}${e.className ? '.' + String(e.className).split(' ')[0] : ''}`);
      // A table or card scrolling sideways inside its own frame hides columns just as well: only
      // the plan drawing, which pans and zooms by design, may.
      const inner = [...document.querySelectorAll<HTMLElement>('main *')]
        .filter((e) => {
          const x = getComputedStyle(e).overflowX;
          return (x === 'auto' || x === 'scroll') && e.scrollWidth > e.clientWidth + 1 && !e.closest('[data-pans]');
        })
        .slice(0, 5)
        .map((e) => `${e.tagName.toLowerCase()}${e.className ? '.' + String(e.className).split(' ')[0] : ''}`);
      return { scrollWidth: el.scrollWidth, clientWidth: el.clientWidth, past, inner };
    });
    await page.screenshot({ path: path.join(SCREENSHOTS, `narrow-${role}-${p.name}.png`), fullPage: true });
    expect({ ...size, past: size.scrollWidth > size.clientWidth ? size.past : [] }).toEqual({
      scrollWidth: size.clientWidth,
      clientWidth: size.clientWidth,
      past: [],
      inner: [],
    });
    expect(browser.outside).toEqual([]);
  });
});
