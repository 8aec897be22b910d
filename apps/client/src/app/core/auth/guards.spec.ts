import { meSchema, type Me } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { noAccessGuard, roleGuard, signedInGuard, signedOutGuard } from './guards';
import { grantedMe, noAccessMe } from './testing';

@Component({ template: 'page' })
class Page {}

describe('route guards', () => {
  let router: Router;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'projects', component: Page, canActivate: [signedInGuard] },
          { path: 'people', component: Page, canActivate: [signedInGuard, roleGuard('principal')] },
          { path: 'fees', component: Page, canActivate: [signedInGuard, roleGuard('principal', 'client')] },
          { path: 'sign-in', component: Page, canActivate: [signedOutGuard] },
          { path: 'no-access', component: Page, canActivate: [noAccessGuard] },
          { path: 'not-permitted', component: Page },
          { path: 'status', component: Page },
        ]),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    router = TestBed.inject(Router);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  /** Navigates while /api/me answers as given; resolves to the address the router settled on. */
  async function visit(url: string, me: Me | 'anonymous' | 'down'): Promise<string> {
    const done = router.navigateByUrl(url);
    await new Promise((r) => setTimeout(r));
    const req = backend.expectOne('/api/me');
    if (me === 'anonymous') replyError(req, 401, { code: 'unauthenticated', message: 'Sign in first.' });
    // Not the API's answer: the proxy in front of it.
    else if (me === 'down') req.flush('Bad gateway', { status: 502, statusText: 'Bad Gateway' });
    else reply(req, meSchema, me);
    await done;
    return router.url;
  }

  it('sends an anonymous visitor to sign in, remembering where they were going', async () => {
    expect(await visit('/projects?sort=name', 'anonymous')).toBe('/sign-in?returnTo=%2Fprojects%3Fsort%3Dname');
  });

  it('lets a signed-in person with access through', async () => {
    expect(await visit('/projects', grantedMe('engineer'))).toBe('/projects');
  });

  it('sends someone signed in without an invitation to the no-access page', async () => {
    expect(await visit('/projects', noAccessMe)).toBe('/no-access');
  });

  it('opens People for the principal only', async () => {
    expect(await visit('/people', grantedMe('principal'))).toBe('/people');
  });

  it.each(['engineer', 'client'] as const)(
    'shows the not-permitted page to a %s who opens People, keeping the address',
    async (role) => {
      const done = router.navigateByUrl('/people');
      await new Promise((r) => setTimeout(r));
      reply(backend.expectOne('/api/me'), meSchema, grantedMe(role));
      await done;
      // skipLocationChange: the address bar keeps /people while the explanation shows.
      expect(router.routerState.snapshot.url).toBe('/not-permitted');
    },
  );

  it('keeps Fees from an engineer', async () => {
    await visit('/fees', grantedMe('engineer'));
    expect(router.routerState.snapshot.url).toBe('/not-permitted');
  });

  it('opens Fees for a client contact (their invoices)', async () => {
    expect(await visit('/fees', grantedMe('client'))).toBe('/fees');
  });

  it('sends a signed-in person away from the sign-in page to where they were heading', async () => {
    expect(await visit('/sign-in?returnTo=%2Fpeople', grantedMe('principal'))).toBe('/people');
  });

  it('never follows a return address that leaves the app', async () => {
    expect(await visit('/sign-in?returnTo=%2F%2Fevil.example%2Fx', grantedMe('principal'))).toBe('/projects');
  });

  it('shows the sign-in page to an anonymous visitor', async () => {
    expect(await visit('/sign-in', 'anonymous')).toBe('/sign-in');
  });

  it('keeps the no-access page for those it is meant for', async () => {
    expect(await visit('/no-access', grantedMe('client'))).toBe('/projects');
  });

  it('treats an unreachable server as not signed in for protected pages (the sign-in page explains)', async () => {
    expect(await visit('/projects', 'down')).toBe('/sign-in?returnTo=%2Fprojects');
  });
});
