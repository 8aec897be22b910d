import path from 'node:path';
import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// Each demo role signs in through the real local identity provider's page, sees the navigation
// its role is offered (and not the rest), and signs out again.

const ROLES = [
  {
    who: 'principal',
    user: DEMO.users.principal,
    roleLabel: 'Principal',
    shown: ['nav-projects', 'nav-drawings', 'nav-fees', 'nav-people', 'nav-firm-dates', 'nav-status'],
    hidden: [] as string[],
  },
  {
    who: 'engineer',
    user: DEMO.users.engineerA,
    roleLabel: 'Engineer',
    shown: ['nav-projects', 'nav-drawings', 'nav-status'],
    hidden: ['nav-fees', 'nav-people', 'nav-firm-dates'],
  },
  {
    who: 'client',
    user: DEMO.users.fenwickContact,
    roleLabel: 'Client contact',
    shown: ['nav-projects', 'nav-drawings', 'nav-fees', 'nav-status'],
    hidden: ['nav-people', 'nav-firm-dates'],
  },
] as const;

describe('signing in and out in Chromium, per role', () => {
  const base = testEnv('E2E_BASE_URL');
  let browser: Awaited<ReturnType<typeof openBrowser>>;
  let page: Page;

  beforeAll(async () => {
    browser = await openBrowser();
    page = browser.page;
  });
  afterAll(() => browser?.close());

  const testId = (id: string) => page.locator(`[data-testid="${id}"]`);

  it.each(ROLES)(
    'the $who signs in through the provider, sees their navigation, and signs out',
    async (role) => {
      // Signed out, the bare address leads to the sign-in page.
      await page.goto(`${base}/`);
      await testId('sign-in').waitFor({ state: 'visible', timeout: 20_000 });
      expect(new URL(page.url()).pathname).toBe('/sign-in');
      await expect(testId('user-menu').count()).resolves.toBe(0);

      // The provider's own page, on loopback.
      await testId('sign-in').click();
      await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
      expect(new URL(page.url()).origin).not.toBe(new URL(base).origin);
      await page.fill('input#email', role.user.email);
      await page.fill('input#password', DEMO_PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();

      // Back in the app, where the sign-in started from.
      await testId('user-menu').waitFor({ state: 'visible', timeout: 20_000 });
      expect(page.url()).toBe(`${base}/projects`);
      await expect(testId('user-name').textContent()).resolves.toBe(role.user.name);
      await expect(testId('user-role').textContent()).resolves.toBe(role.roleLabel);
      for (const id of role.shown) await testId(id).waitFor({ state: 'visible' });
      for (const id of role.hidden) await expect(testId(id).count()).resolves.toBe(0);
      // The projects list comes from the server, filtered for this person.
      await testId('projects-table').or(page.getByText('No projects to show yet')).waitFor({ timeout: 20_000 });
      await page.screenshot({ path: path.join(SCREENSHOTS, `signed-in-${role.who}.png`) });

      // Sign out here, then at the provider, and land signed out.
      await testId('user-menu').click();
      await testId('sign-out').click();
      const providerSignOut = page.getByRole('button', { name: 'Sign out' });
      await providerSignOut.waitFor({ state: 'visible', timeout: 20_000 });
      await providerSignOut.click();
      await page.waitForURL((u) => u.origin === new URL(base).origin, { timeout: 20_000 });
      await testId('sign-in').waitFor({ state: 'visible', timeout: 20_000 });
      await expect(testId('user-menu').count()).resolves.toBe(0);
      const me = await page.evaluate(async () => (await fetch('/api/me')).status);
      expect(me).toBe(401);
    },
    90_000,
  );

  it('an engineer who types the People address is told it is not part of their role', async () => {
    await page.goto(`${base}/people`);
    await testId('sign-in').click();
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', DEMO.users.engineerA.email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await testId('not-permitted').waitFor({ state: 'visible', timeout: 20_000 });
    expect(new URL(page.url()).pathname).toBe('/people');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'not-permitted-engineer.png') });
  }, 60_000);

  it('asked for nothing outside loopback and logged no errors', () => {
    expect(browser.outside).toEqual([]);
    expect(browser.consoleErrors).toEqual([]);
  });
});
