import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const SCREENSHOTS = path.resolve(__dirname, '../e2e/screenshots');

/**
 * Debian's Chromium driven by playwright-core (no browser download). Every request that would
 * leave loopback is aborted and recorded, so a test can assert the app needs nothing outside;
 * console errors are recorded too, so a test can assert the page logged none.
 */
export async function openBrowser(options: { bypassCSP?: boolean } = {}): Promise<{
  context: BrowserContext;
  page: Page;
  outside: string[];
  consoleErrors: string[];
  close: () => Promise<void>;
}> {
  const profile = mkdtempSync(path.join(tmpdir(), 'trabeate-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 800 },
    // Only for injecting axe-core with addScriptTag: the app's policy (rightly) refuses inline scripts.
    bypassCSP: options.bypassCSP ?? false,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const outside: string[] = [];
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url());
    if (['127.0.0.1', 'localhost', '[::1]'].includes(url.hostname) || url.protocol === 'data:') return route.continue();
    outside.push(url.href);
    return route.abort();
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const consoleErrors: string[] = [];
  page.on('console', (m) => {
    // Signed out, /api/me answers the expected 401, which Chromium logs as an error; the rest are faults.
    const expected401 = /401 \(Unauthorized\)/.test(m.text()) && m.location().url.endsWith('/api/me');
    if (m.type() === 'error' && !expected401) consoleErrors.push(`${m.text()} (${m.location().url})`);
  });
  mkdirSync(SCREENSHOTS, { recursive: true });
  return {
    context,
    page,
    outside,
    consoleErrors,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/**
 * One API call from a signed-in page, with the CSRF header the app sends (for a test's set-up:
 * what the person does is done through the page).
 */
export function pageApi(
  page: Page,
  method: string,
  url: string,
  body?: unknown,
): Promise<{ status: number; body: any }> {
  return page.evaluate(
    async ([m, u, b]) => {
      const xsrf = decodeURIComponent(/(?:^|; )XSRF-TOKEN=([^;]+)/.exec(document.cookie)?.[1] ?? '');
      const res = await fetch(u as string, {
        method: m as string,
        headers: { 'Content-Type': 'application/json', 'X-XSRF-TOKEN': xsrf },
        body: b === undefined ? undefined : JSON.stringify(b),
      });
      return { status: res.status, body: res.status === 204 ? null : await res.json() };
    },
    [method, url, body] as const,
  );
}
