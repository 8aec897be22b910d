import { replyError } from '../../../testing/api-replies';
import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { Notice } from '../notice';
import { anonymousOk } from './auth-context';
import { authInterceptor } from './auth.interceptor';
import { Session } from './session';

@Component({ template: '' })
class Blank {}

describe('authInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let router: Router;
  let shown: string[];

  beforeEach(async () => {
    shown = [];
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'projects/:id', component: Blank },
          { path: 'sign-in', component: Blank },
        ]),
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
        { provide: Notice, useValue: { show: (m: string) => shown.push(m) } },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
    await router.navigateByUrl('/projects/abc?tab=members');
  });

  afterEach(() => backend.verify());

  it('when a request answers 401, goes to the sign-in page with the current address to come back to', async () => {
    const result = firstValueFrom(http.get('/api/projects'));
    replyError(backend.expectOne('/api/projects'), 401, { code: 'unauthenticated', message: 'Sign in first.' });
    await expect(result).rejects.toMatchObject({ status: 401 });
    await new Promise((r) => setTimeout(r));
    const url = router.parseUrl(router.url);
    expect(url.root.children['primary']?.segments.map((s) => s.path)).toEqual(['sign-in']);
    expect(url.queryParams).toEqual({ returnTo: '/projects/abc?tab=members' });
    expect(TestBed.inject(Session).state().status).toBe('anonymous');
  });

  it('when the session expired, says so on the sign-in page', async () => {
    const result = firstValueFrom(http.get('/api/projects'));
    replyError(backend.expectOne('/api/projects'), 401, {
      code: 'session_expired',
      message: 'Your session has ended.',
    });
    await expect(result).rejects.toBeTruthy();
    await new Promise((r) => setTimeout(r));
    expect(router.parseUrl(router.url).queryParams).toEqual({
      returnTo: '/projects/abc?tab=members',
      reason: 'expired',
    });
  });

  it('does not leave the page for a 401 that the request expects (who am I, public pages)', async () => {
    const result = firstValueFrom(http.get('/api/me', { context: anonymousOk() }));
    replyError(backend.expectOne('/api/me'), 401, { code: 'unauthenticated', message: 'x' });
    await expect(result).rejects.toMatchObject({ status: 401 });
    await new Promise((r) => setTimeout(r));
    expect(router.url).toBe('/projects/abc?tab=members');
  });

  it('when a request answers 403, shows the server’s reason and hands the error to the caller', async () => {
    const result = firstValueFrom(http.delete('/api/people/1/access'));
    replyError(backend.expectOne('/api/people/1/access'), 403, {
      code: 'forbidden',
      message: 'Only the principal can remove access.',
    });
    await expect(result).rejects.toMatchObject({ status: 403 });
    expect(shown).toEqual(['Only the principal can remove access.']);
    expect(router.url).toBe('/projects/abc?tab=members');
  });

  it('for a 403 without our error shape, still says in plain words that the role does not allow it', async () => {
    const result = firstValueFrom(http.get('/api/fees'));
    // Not the API's answer: a proxy or gateway that refused the request itself.
    backend.expectOne('/api/fees').flush('Forbidden', { status: 403, statusText: 'Forbidden' });
    await expect(result).rejects.toBeTruthy();
    expect(shown).toEqual([expect.stringContaining('Your role does not allow this')]);
  });

  it('leaves other errors to the caller', async () => {
    const result = firstValueFrom(http.get('/api/projects'));
    replyError(backend.expectOne('/api/projects'), 500, { code: 'internal', message: 'x' });
    await expect(result).rejects.toMatchObject({ status: 500 });
    expect(shown).toEqual([]);
    expect(router.url).toBe('/projects/abc?tab=members');
  });
});
