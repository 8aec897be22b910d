import { meSchema, logoutResponseSchema } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { PageLocation } from './page-location';
import { Session, safeReturnTo } from './session';
import { grantedMe } from './testing';

describe('Session', () => {
  let session: Session;
  let backend: HttpTestingController;
  let went: string[];

  beforeEach(() => {
    went = [];
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PageLocation, useValue: { assign: (url: string) => went.push(url) } },
      ],
    });
    session = TestBed.inject(Session);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  it('reads /api/me once and exposes the role', async () => {
    const first = session.load();
    const second = session.load();
    reply(backend.expectOne('/api/me'), meSchema, grantedMe('principal', 'Aster Pellow'));
    await Promise.all([first, second]);
    expect(session.state().status).toBe('granted');
    expect(session.user()?.displayName).toBe('Aster Pellow');
    expect(session.isPrincipal()).toBe(true);
    expect(session.roleLabel()).toBe('Principal');
  });

  it('says the server is away when /api/me fails for another reason than 401', async () => {
    const done = session.load();
    replyError(backend.expectOne('/api/me'), 503, {
      code: 'service_unavailable',
      message: 'The database is not answering.',
    });
    await done;
    expect(session.state()).toEqual({ status: 'unreachable', message: 'The database is not answering.' });
  });

  it('signs in by a full-page trip to the server with the return address', () => {
    session.signIn('/projects/7?tab=members');
    expect(went).toEqual(['/api/auth/login?returnTo=%2Fprojects%2F7%3Ftab%3Dmembers']);
  });

  it('signs out on the server, then goes to the provider’s sign-out address', async () => {
    const done = session.signOut();
    const req = backend.expectOne('/api/auth/logout');
    expect(req.request.method).toBe('POST');
    reply(req, logoutResponseSchema, { endSessionUrl: 'http://127.0.0.1:4320/session/end?id_token_hint=x' });
    await done;
    expect(went).toEqual(['http://127.0.0.1:4320/session/end?id_token_hint=x']);
    expect(session.state().status).toBe('anonymous');
  });

  it('goes home after signing out when the provider has no sign-out address', async () => {
    const done = session.signOut();
    reply(backend.expectOne('/api/auth/logout'), logoutResponseSchema, { endSessionUrl: null });
    await done;
    expect(went).toEqual(['/']);
  });

  it.each([
    ['/projects?x=1', '/projects?x=1'],
    ['//evil.example/x', '/'],
    ['/\\evil.example', '/'],
    ['https://evil.example/', '/'],
    ['/sign-in?returnTo=/x', '/'],
    [null, '/'],
  ])('accepts only addresses inside the app as return addresses: %s → %s', (input, expected) => {
    expect(safeReturnTo(input)).toBe(expected);
  });
});
