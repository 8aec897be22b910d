import path from 'node:path';
import knex, { type Knex } from 'knex';
import type { Locator, Page } from 'playwright-core';
import { outboxMessageSchema } from '@trabeate/contracts';
import { ensureAccount } from '../../apps/identity/src/accounts';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { openBrowser, SCREENSHOTS } from '../support/browser';
import { testEnv } from '../support/env';

// The principal invites a client contact from the People page; the invitation mail arrives; the
// invitee follows its link, signs in at the local provider and finds the project, seeing its stage
// progress but not the firm's review notes or working files.

type Browser = Awaited<ReturnType<typeof openBrowser>>;

describe('inviting a client contact, from the dialog to their first look at the project, in Chromium', () => {
  const base = testEnv('E2E_BASE_URL');
  const outbox = testEnv('E2E_OUTBOX_URL');
  // A new invented address each run: the e2e database is shared by every browser test and kept.
  const run = Date.now().toString(36);
  const invitee = { email: `maelle.thorne.${run}@fenwickrow.example`, name: `Maëlle Thorne ${run}` };
  let db: Knex;
  let principal: Browser;
  let guest: Browser;
  let link = '';

  const testId = (page: Page, id: string): Locator => page.locator(`[data-testid="${id}"]`);
  const shot = (page: Page, name: string) =>
    page.screenshot({ path: path.join(SCREENSHOTS, `invite-${name}.png`), fullPage: true });

  async function signInAtProvider(page: Page, user: { email: string }): Promise<void> {
    await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
    await page.fill('input#email', user.email);
    await page.fill('input#password', DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
  }

  async function choose(page: Page, select: string, option: string | RegExp): Promise<void> {
    await testId(page, select).click();
    await page.getByRole('option', { name: option }).click();
  }

  beforeAll(async () => {
    db = knex({ client: 'pg', connection: testEnv('E2E_DATABASE_URL'), pool: { min: 0, max: 1 } });
    // The local provider knows only the accounts it holds; a real firm's provider would know the invitee.
    await ensureAccount(db, { email: invitee.email, name: invitee.name, password: DEMO_PASSWORD });
    principal = await openBrowser();
    guest = await openBrowser();
  });
  afterAll(async () => {
    await principal?.close();
    await guest?.close();
    await db?.destroy();
  });

  it('the principal invites the contact through the dialog, choosing organisation and project', async () => {
    const page = principal.page;
    await page.goto(`${base}/people`);
    await testId(page, 'sign-in').click({ timeout: 20_000 });
    await signInAtProvider(page, DEMO.users.principal);
    await testId(page, 'people-table').waitFor({ timeout: 20_000 });

    await testId(page, 'invite-open').click();
    await testId(page, 'invite-email').fill(invitee.email);
    await testId(page, 'invite-name').fill(invitee.name);
    await choose(page, 'invite-role', 'Client contact');
    await choose(page, 'invite-organisation', DEMO.clients.fenwick.name);
    await testId(page, 'invite-projects').click();
    await page.getByRole('option', { name: new RegExp(DEMO.projects.kestrel.reference) }).click();
    await page.keyboard.press('Escape');
    await shot(page, '1-dialog');
    await testId(page, 'invite-send').click();

    const url = testId(page, 'invitation-url');
    await url.waitFor({ timeout: 20_000 });
    link = (await url.textContent())?.trim() ?? '';
    expect(link).toMatch(new RegExp(`^${base}/invitations/[\\w-]{20,}$`));
  });

  it('the invitation mail arrives in the outbox with that link', async () => {
    let text = '';
    for (let i = 0; i < 40 && !text.includes(link); i++) {
      const list = (await (await fetch(`${outbox}/messages`)).json()) as Array<{ id: string; to: string[] }>;
      const mine = list.find((m) => m.to.some((to) => to.toLowerCase() === invitee.email));
      if (mine) {
        const full = outboxMessageSchema.parse(await (await fetch(`${outbox}/messages/${mine.id}`)).json());
        text = full.text;
      } else await new Promise((r) => setTimeout(r, 500));
    }
    expect(text).toContain(link);
  });

  it('the invitee follows the link, signs in, and finds the project with its stages but not the firm’s notes', async () => {
    const page = guest.page;
    await page.goto(link);
    await testId(page, 'invitation').filter({ hasText: invitee.email }).waitFor({ timeout: 20_000 });
    await testId(page, 'invitation-sign-in').click();
    await signInAtProvider(page, invitee);
    await testId(page, 'user-name').filter({ hasText: invitee.name }).waitFor({ timeout: 20_000 });

    await page.goto(`${base}/projects`);
    const row = page.getByRole('link', { name: 'Kestrel Yard apartments' });
    await row.waitFor({ timeout: 20_000 });
    await row.click();
    await page.waitForURL(new RegExp(`/projects/${DEMO.projects.kestrel.id}`), { timeout: 20_000 });
    await testId(page, 'stage-panel').waitFor({ timeout: 20_000 });
    await expect(testId(page, 'stage-timeline').locator('li').count()).resolves.toBe(6);
    await testId(page, 'outcome-note').waitFor({ timeout: 20_000 });
    expect(await testId(page, 'comment').count()).toBe(0);
    expect(await page.locator('tb-deliverables-panel, tb-stage-comments').count()).toBe(0);
    await shot(page, '2-client-project');
  });

  it('asked for nothing outside loopback and logged no errors', () => {
    expect(principal.outside).toEqual([]);
    expect(guest.outside).toEqual([]);
    expect(principal.consoleErrors).toEqual([]);
    expect(guest.consoleErrors).toEqual([]);
  });
});
