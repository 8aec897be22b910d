import { logoutResponseSchema, meSchema, outboxMessageSchema, type Me } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { BreakpointObserver, BreakpointState } from '@angular/cdk/layout';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { BehaviorSubject, map } from 'rxjs';
import { PageLocation } from '../auth/page-location';
import { Session } from '../auth/session';
import { grantedMe } from '../auth/testing';
import { Shell } from './shell';

/** Stands in for the browser's media queries so a test can pick the screen width. */
class FakeBreakpoints {
  readonly narrow = new BehaviorSubject(false);
  observe() {
    return this.narrow.pipe(map((matches): BreakpointState => ({ matches, breakpoints: {} })));
  }
}

describe('Shell', () => {
  let fixture: ComponentFixture<Shell>;
  let breakpoints: FakeBreakpoints;
  let backend: HttpTestingController;
  let went: string[];
  const el = (): HTMLElement => fixture.nativeElement as HTMLElement;
  const menuButton = () => el().querySelector('button[aria-label="Show or hide navigation"]');
  const navItems = () =>
    Array.from(el().querySelectorAll<HTMLAnchorElement>('nav[aria-label="Main"] a')).map((a) => [
      a.getAttribute('data-testid'),
      a.querySelector('.nav-title')?.textContent?.trim(),
      a.getAttribute('href'),
    ]);

  /** Starts the shell with /api/me answering as given. */
  async function start(me: Me | 'anonymous', outbox: 'absent' | 'present' = 'absent'): Promise<void> {
    const loaded = TestBed.inject(Session).load();
    const req = backend.expectOne('/api/me');
    if (me === 'anonymous') replyError(req, 401, { code: 'unauthenticated', message: 'Sign in first.' });
    else reply(req, meSchema, me);
    await loaded;
    fixture = TestBed.createComponent(Shell);
    // Not whenStable yet: the outbox question is a pending task until it is answered.
    fixture.detectChanges();
    TestBed.tick();
    // Only the principal asks whether the server keeps a development outbox.
    for (const probe of backend.match('/api/dev/outbox')) {
      if (outbox === 'present') reply(probe, outboxMessageSchema.array(), []);
      else replyError(probe, 404, { code: 'not_found', message: 'Not found.' });
    }
    await fixture.whenStable();
  }

  beforeEach(() => {
    breakpoints = new FakeBreakpoints();
    went = [];
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: BreakpointObserver, useValue: breakpoints },
        { provide: PageLocation, useValue: { assign: (url: string) => went.push(url) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
  });

  describe('for a principal', () => {
    beforeEach(() => start(grantedMe('principal', 'Aster Pellow')));

    it('offers a skip link as the first focusable element, which moves focus to the page', () => {
      const first = el().querySelector<HTMLElement>('a[href], button, input, select, textarea, [tabindex]');
      expect(first?.getAttribute('data-testid')).toBe('skip-link');
      expect(first?.textContent).toContain('Skip to main content');
      first!.click();
      expect(document.activeElement?.id).toBe('main');
      expect(document.activeElement?.tagName).toBe('MAIN');
    });

    it('shows the Trabeate wordmark linking home', () => {
      const home = el().querySelector('a.wordmark');
      expect(home?.textContent).toContain('Trabeate');
      expect(home?.getAttribute('href')).toBe('/');
    });

    it('offers Projects, Drawings, Fees, People, Dates and time, and System status', () => {
      expect(navItems()).toEqual([
        ['nav-projects', 'Projects', '/projects'],
        ['nav-drawings', 'Drawings', '/drawings'],
        ['nav-fees', 'Fees', '/fees'],
        ['nav-people', 'People', '/people'],
        ['nav-firm-dates', 'Dates and time', '/firm/settings'],
        ['nav-status', 'System status', '/status'],
      ]);
    });

    it('shows the signed-in name and role, and signs out from the account panel', async () => {
      const account = el().querySelector<HTMLButtonElement>('[data-testid="user-menu"]');
      expect(account?.querySelector('[data-testid="user-name"]')?.textContent).toBe('Aster Pellow');
      expect(account?.querySelector('[data-testid="user-role"]')?.textContent).toBe('Principal');
      expect(el().querySelector('[data-testid="sign-out"]')).toBeNull();

      account?.click();
      await fixture.whenStable();
      expect(account?.getAttribute('aria-expanded')).toBe('true');
      (el().querySelector('[data-testid="sign-out"]') as HTMLButtonElement).click();
      reply(backend.expectOne('/api/auth/logout'), logoutResponseSchema, { endSessionUrl: null });
      await new Promise((r) => setTimeout(r));
      expect(went).toEqual(['/']);
    });

    it('carries the caution that results are preliminary and final design needs a licensed engineer', () => {
      const caution = el().querySelector('[data-testid="caution"]')?.textContent?.replace(/\s+/g, ' ');
      expect(caution).toContain(
        'Trabeate plans and checks schemes; results are preliminary, local codes govern, and final design belongs to a licensed structural engineer.',
      );
    });

    it('on a wide screen keeps the navigation open beside the page, with no menu button', () => {
      expect(menuButton()).toBeNull();
      const nav = el().querySelector('mat-sidenav');
      expect(nav?.classList).toContain('mat-drawer-side');
      expect(nav?.classList).toContain('mat-drawer-opened');
    });

    it('on a narrow screen folds the navigation into a drawer that the menu button opens', async () => {
      breakpoints.narrow.next(true);
      await fixture.whenStable();

      const nav = el().querySelector('mat-sidenav');
      expect(nav?.classList).toContain('mat-drawer-over');
      expect(nav?.classList).not.toContain('mat-drawer-opened');
      const button = menuButton() as HTMLButtonElement;
      expect(button).not.toBeNull();
      expect(button.getAttribute('aria-expanded')).toBe('false');

      button.click();
      await fixture.whenStable();
      expect(nav?.classList).toContain('mat-drawer-opened');
      expect(button.getAttribute('aria-expanded')).toBe('true');
    });
  });

  describe('for a principal where the server keeps mail in its local fake', () => {
    beforeEach(() => start(grantedMe('principal', 'Aster Pellow'), 'present'));

    it('adds the development Outbox before System status', () => {
      expect(navItems()).toEqual([
        ['nav-projects', 'Projects', '/projects'],
        ['nav-drawings', 'Drawings', '/drawings'],
        ['nav-fees', 'Fees', '/fees'],
        ['nav-people', 'People', '/people'],
        ['nav-firm-dates', 'Dates and time', '/firm/settings'],
        ['nav-outbox', 'Outbox', '/dev/outbox'],
        ['nav-status', 'System status', '/status'],
      ]);
    });
  });

  describe('for an engineer', () => {
    beforeEach(() => start(grantedMe('engineer', 'Cato Brennagh')));

    it('offers Projects, Drawings and System status, with no Fees and no People', () => {
      expect(navItems()).toEqual([
        ['nav-projects', 'Projects', '/projects'],
        ['nav-drawings', 'Drawings', '/drawings'],
        ['nav-status', 'System status', '/status'],
      ]);
      expect(el().querySelector('[data-testid="user-role"]')?.textContent).toBe('Engineer');
      // Nobody but the principal asks for the outbox at all.
      backend.expectNone('/api/dev/outbox');
    });
  });

  describe('for a client contact', () => {
    beforeEach(() => start(grantedMe('client', 'Maud Ferrier')));

    it('offers Projects, Drawings, Fees (their invoices) and System status, with no People', () => {
      expect(navItems()).toEqual([
        ['nav-projects', 'Projects', '/projects'],
        ['nav-drawings', 'Drawings', '/drawings'],
        ['nav-fees', 'Fees', '/fees'],
        ['nav-status', 'System status', '/status'],
      ]);
      expect(el().querySelector('[data-testid="nav-fees"]')?.textContent).toContain('Your invoices');
      expect(el().querySelector('[data-testid="user-role"]')?.textContent).toBe('Client contact');
    });
  });

  describe('for a visitor who is not signed in', () => {
    beforeEach(() => start('anonymous'));

    it('offers only the public System status page and a way to sign in', () => {
      expect(navItems()).toEqual([['nav-status', 'System status', '/status']]);
      expect(el().querySelector('[data-testid="user-menu"]')).toBeNull();
      (el().querySelector('[data-testid="toolbar-sign-in"]') as HTMLButtonElement).click();
      expect(went).toEqual(['/api/auth/login?returnTo=%2F']);
    });
  });
});
