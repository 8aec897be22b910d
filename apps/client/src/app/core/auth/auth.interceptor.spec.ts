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
    backend
      .expectOne('/api/projects')
      .flush(
        { error: { code: 'unauthenticated', message: 'Sign in first.' } },
        { status: 401, statusText: 'Unauthorized' },
      );
    await expect(result).rejects.toMatchObject({ status: 401 });
    await new Promise((r) => setTimeout(r));
    const url = router.parseUrl(router.url);
    expect(url.root.children['primary']?.segments.map((s) => s.path)).toEqual(['sign-in']);
    expect(url.queryParams).toEqual({ returnTo: '/projects/abc?tab=members' });
    expect(TestBed.inject(Session).state().status).toBe('anonymous');
  });

  it('when the session expired, says so on the sign-in page', async () => {
    const result = firstValueFrom(http.get('/api/projects'));
    backend
      .expectOne('/api/projects')
      .flush(
        { error: { code: 'session_expired', message: 'Your session has ended.' } },
        { status: 401, statusText: 'Unauthorized' },
      );
    await expect(result).rejects.toBeTruthy();
    await new Promise((r) => setTimeout(r));
    expect(router.parseUrl(router.url).queryParams).toEqual({
      returnTo: '/projects/abc?tab=members',
      reason: 'expired',
    });
  });

  it('does not leave the page for a 401 that the request expects (who am I, public pages)', async () => {
    const result = firstValueFrom(http.get('/api/me', { context: anonymousOk() }));
    backend
      .expectOne('/api/me')
      .flush({ error: { code: 'unauthenticated', message: 'x' } }, { status: 401, statusText: 'Unauthorized' });
    await expect(result).rejects.toMatchObject({ status: 401 });
    await new Promise((r) => setTimeout(r));
    expect(router.url).toBe('/projects/abc?tab=members');
  });

  it('when a request answers 403, shows the server’s reason and hands the error to the caller', async () => {
    const result = firstValueFrom(http.delete('/api/people/1/access'));
    backend
      .expectOne('/api/people/1/access')
      .flush(
        { error: { code: 'forbidden', message: 'Only the principal can remove access.' } },
        { status: 403, statusText: 'Forbidden' },
      );
    await expect(result).rejects.toMatchObject({ status: 403 });
    expect(shown).toEqual(['Only the principal can remove access.']);
    expect(router.url).toBe('/projects/abc?tab=members');
  });

  it('for a 403 without our error shape, still says in plain words that the role does not allow it', async () => {
    const result = firstValueFrom(http.get('/api/fees'));
    backend.expectOne('/api/fees').flush('Forbidden', { status: 403, statusText: 'Forbidden' });
    await expect(result).rejects.toBeTruthy();
    expect(shown).toEqual([expect.stringContaining('Your role does not allow this')]);
  });

  it('leaves other errors to the caller', async () => {
    const result = firstValueFrom(http.get('/api/projects'));
    backend
      .expectOne('/api/projects')
      .flush({ error: { code: 'internal', message: 'x' } }, { status: 500, statusText: 'Error' });
    await expect(result).rejects.toMatchObject({ status: 500 });
    expect(shown).toEqual([]);
    expect(router.url).toBe('/projects/abc?tab=members');
  });
});
