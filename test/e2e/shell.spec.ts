import path from 'node:path';
import type { Page } from 'playwright-core';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

describe('the shell in Chromium, signed out', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Awaited<ReturnType<typeof openBrowser>>;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
  });
  afterAll(() => browser?.close());

  it('shows the status page with every dependency up, and nothing loads from outside', async () => {
    await page.goto(`${base}/status`);
    const db = page.locator('[data-testid=status-database]');
    await db.waitFor({ state: 'visible', timeout: 20_000 });
    // The e2e API runs with the S3 and SMTP fakes and its own job queue: all four answer.
    for (const name of ['database', 'jobQueue', 'objectStorage', 'mailRelay']) {
      await expect(page.locator(`[data-testid=status-${name}]`).textContent()).resolves.toMatch(/^\s*up\s*$/i);
    }
    await page.screenshot({ path: path.join(SCREENSHOTS, 'status.png'), fullPage: true });
    expect(browser.outside).toEqual([]);
    expect(browser.consoleErrors).toEqual([]);
  });

  it('leads a signed-out visitor from the bare address to the sign-in page', async () => {
    await page.goto(`${base}/`);
    await page.locator('[data-testid=sign-in]').waitFor({ state: 'visible', timeout: 20_000 });
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    // Signed out, only the public page is offered in the navigation.
    await expect(page.locator('[data-testid=nav-projects]').count()).resolves.toBe(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'sign-in.png') });
  });

  it('keeps the navigation reachable on a phone-sized screen', async () => {
    await page.setViewportSize({ width: 390, height: 800 });
    await page.goto(`${base}/status`);
    await page.locator('[data-testid=status-database]').waitFor({ timeout: 20_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'status-narrow.png') });
    await page
      .getByRole('button', { name: /menu|navigation/i })
      .first()
      .click();
    await page.locator('[data-testid=nav-status]').waitFor({ state: 'visible' });
  });
});
