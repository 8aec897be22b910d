import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const SCREENSHOTS = path.resolve(__dirname, '../e2e/screenshots');

/**
 * Debian's Chromium driven by playwright-core (no browser download). Every request that would
 * leave loopback is aborted and recorded, so a test can assert the app needs nothing outside.
 */
export async function openBrowser(): Promise<{ context: BrowserContext; page: Page; outside: string[]; close: () => Promise<void> }> {
  const profile = mkdtempSync(path.join(tmpdir(), 'trabeate-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 800 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  });
  const outside: string[] = [];
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url());
    if (['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname) || url.protocol === 'data:') return route.continue();
    outside.push(url.href);
    return route.abort();
  });
  const page = context.pages()[0] ?? (await context.newPage());
  mkdirSync(SCREENSHOTS, { recursive: true });
  return {
    context,
    page,
    outside,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
