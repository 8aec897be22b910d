import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { invoiceListSchema, meSchema, projectListSchema, type Me } from '@trabeate/contracts';
import { reply, replyError } from '../testing/api-replies';
import { routes } from './app.routes';
import { grantedMe } from './core/auth/testing';

// Lazy routes compile their page on first use; on a busy two-core machine that alone can pass 5 s.
jest.setTimeout(20_000);
describe('app routes', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideRouter(routes, withComponentInputBinding()), provideHttpClient(), provideHttpClientTesting()],
    });
    harness = await RouterTestingHarness.create();
    backend = TestBed.inject(HttpTestingController);
  });

  const shownText = () => (harness.routeNativeElement?.textContent ?? '').replace(/\s+/g, ' ');

  /** Navigates, answering the one /api/me question the guards ask. */
  async function open(url: string, me: Me | 'anonymous'): Promise<void> {
    const done = harness.navigateByUrl(url);
    await new Promise((r) => setTimeout(r));
    const req = backend.match('/api/me');
    for (const r of req) {
      if (me === 'anonymous') replyError(r, 401, { code: 'unauthenticated', message: 'Sign in to use Trabeate.' });
      else reply(r, meSchema, me);
    }
    await done;
    harness.detectChanges();
  }

  it('opens Projects for the bare address when signed in, and asks the server for the list', async () => {
    await open('/', grantedMe('engineer'));
    expect(TestBed.inject(Router).url).toBe('/projects');
    reply(
      backend.expectOne((r) => r.url === '/api/projects'),
      projectListSchema,
      { items: [], total: 0, page: 1, pageSize: 25 },
    );
    await harness.fixture.whenStable();
    expect(shownText()).toContain('No projects to show yet');
  });

  it('sends an anonymous visitor at the bare address to the sign-in page', async () => {
    await open('/', 'anonymous');
    expect(TestBed.inject(Router).url).toBe('/sign-in?returnTo=%2Fprojects');
    expect(shownText()).toContain('Sign in to Trabeate');
  });

  it('/fees opens the Fees page for a client, who is asked for their invoices only', async () => {
    await open('/fees', grantedMe('client'));
    expect(TestBed.inject(Router).url).toBe('/fees');
    reply(
      backend.expectOne((r) => r.url === '/api/invoices'),
      invoiceListSchema,
      { items: [], total: 0, page: 1, pageSize: 25 },
    );
    backend.expectNone('/api/receivables');
    await harness.fixture.whenStable();
    expect(shownText()).toContain('No invoices yet');
  });

  it('/drawings opens the register of the first project the caller can see', async () => {
    await open('/drawings', grantedMe('principal'));
    reply(
      backend.expectOne((r) => r.url === '/api/projects'),
      projectListSchema,
      { items: [], total: 0, page: 1, pageSize: 100 },
    );
    await harness.fixture.whenStable();
    harness.detectChanges();
    expect(shownText()).toContain('No project to show drawings for');
  });

  it('/status is public: it loads without asking who is signed in and asks the server for its health', async () => {
    await harness.navigateByUrl('/status');
    harness.detectChanges();
    backend.expectNone('/api/me');
    backend.expectOne('/api/health');
    expect(shownText()).toContain('System status');
  });

  it('/invitations/:token is public and asks for the invitation preview', async () => {
    await harness.navigateByUrl('/invitations/abc123abc123abc123abc123');
    harness.detectChanges();
    backend.expectNone('/api/me');
    backend.expectOne('/api/invitations/abc123abc123abc123abc123');
  });

  it('an unknown address says there is no page there', async () => {
    await harness.navigateByUrl('/no/such/page');
    expect(shownText()).toContain('There is no page at this address');
  });
});
