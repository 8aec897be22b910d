import type { Page } from 'playwright-core';
import { DEMO } from '../../seeds/demo-data';
import { DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { DEMO_PASSWORD } from '../../seeds/identity';

// The main pages of the app for each role that sees them, shared by the accessibility and the
// narrow-screen checks; a new main page gets its row here once, and both check it.

export const kestrel = `/projects/${DEMO.projects.kestrel.id}`;
const register = `/drawings?project=${DEMO.projects.kestrel.id}`;
const schemes = `${kestrel}/schemes`;
const planning = `${schemes}/${DEMO_SCHEMES.fewer.id}`;
const compare = `${schemes}/compare?a=${DEMO_SCHEMES.full.id}&b=${DEMO_SCHEMES.fewer.id}`;
// The firm's own screens, shared by the principal and the engineers.
const WORK_PAGES: MainPage[] = [
  { name: 'register', url: register, ready: '[data-testid="drawings-table"]' },
  { name: 'schemes', url: schemes, ready: '[data-testid="scheme-link"]' },
  { name: 'planning', url: planning, ready: '[data-testid="plan-editor"]' },
  { name: 'compare', url: compare, ready: '[data-testid="compare-summary"]' },
];

export interface MainPage {
  name: string;
  url: string;
  /** What shows once the page has drawn its content (not a spinner). */
  ready: string;
}

export async function signIn(page: Page, base: string, user: { email: string; name: string }): Promise<void> {
  await page.goto(`${base}/projects`);
  await page.locator('[data-testid="sign-in"]').click({ timeout: 20_000 });
  await page.locator('input#email').waitFor({ state: 'visible', timeout: 20_000 });
  await page.fill('input#email', user.email);
  await page.fill('input#password', DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.locator('[data-testid="user-name"]').filter({ hasText: user.name }).waitFor({ timeout: 20_000 });
}

/** Opens a page and waits until it has drawn its content (not a spinner). */
export async function visit(page: Page, url: string, ready: string): Promise<void> {
  await page.goto(url);
  await page.locator(ready).first().waitFor({ state: 'visible', timeout: 20_000 });
  await page.waitForLoadState('networkidle');
  // Let Material's entry animations finish so colours are measured at rest.
  await page.waitForTimeout(300);
}

export const ROLES: Array<{
  role: string;
  user: { email: string; name: string } | null;
  pages: MainPage[];
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
      { name: 'firm-dates', url: '/firm/settings', ready: '[data-testid="firm-dates-form"]' },
      { name: 'outbox', url: '/dev/outbox', ready: 'main h1' },
      { name: 'status', url: '/status', ready: '[data-testid="status-database"]' },
      ...WORK_PAGES,
      { name: 'fees', url: '/fees', ready: '[data-testid="invoices-table"]' },
    ],
  },
  {
    role: 'engineer',
    user: DEMO.users.engineerA,
    pages: [
      { name: 'projects', url: '/projects', ready: '[data-testid="projects-table"]' },
      { name: 'project', url: kestrel, ready: '[data-testid="stage-panel"]' },
      { name: 'status', url: '/status', ready: '[data-testid="status-database"]' },
      ...WORK_PAGES,
    ],
  },
  {
    role: 'client',
    user: DEMO.users.fenwickContact,
    pages: [
      { name: 'projects', url: '/projects', ready: '[data-testid="projects-table"]' },
      { name: 'project', url: kestrel, ready: '[data-testid="stage-panel"]' },
      { name: 'register', url: register, ready: '[data-testid="drawings-table"], tb-empty-state' },
      // Fenwick Row has no invoice in the demo (they are Alder Lane's): the empty state is the page.
      { name: 'fees', url: '/fees', ready: '[data-testid="invoices-table"], tb-empty-state' },
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
