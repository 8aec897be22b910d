import path from 'node:path';
import type { Page } from 'playwright-core';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

describe('the shell in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Awaited<ReturnType<typeof openBrowser>>;
  let page: Page;
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(m.text());
    });
  });
  afterAll(() => browser?.close());

  it('shows the status page with the database up, and nothing loads from outside', async () => {
    await page.goto(`${base}/status`);
    const db = page.locator('[data-testid=db-status]');
    await db.waitFor({ state: 'visible', timeout: 20_000 });
    await expect(db.textContent()).resolves.toMatch(/^\s*up\s*$/i);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'status.png'), fullPage: true });
    expect(browser.outside).toEqual([]);
    expect(consoleErrors).toEqual([]);
  });

  it('navigates between the areas from the side navigation', async () => {
    await page.goto(`${base}/`);
    for (const area of ['Projects', 'Drawings', 'Fees']) {
      await page.getByRole('link', { name: new RegExp(area) }).first().click();
      await page.waitForURL(new RegExp(`/${area.toLowerCase()}`));
    }
    await page.screenshot({ path: path.join(SCREENSHOTS, 'fees.png') });
  });

  it('keeps the navigation reachable on a phone-sized screen', async () => {
    await page.setViewportSize({ width: 390, height: 800 });
    await page.goto(`${base}/status`);
    await page.locator('[data-testid=db-status]').waitFor({ timeout: 20_000 });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'status-narrow.png') });
    await page.getByRole('button', { name: /menu|navigation/i }).first().click();
    await page.getByRole('link', { name: /Projects/ }).first().waitFor({ state: 'visible' });
  });
});
