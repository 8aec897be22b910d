import { healthSchema, type Health } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HEALTH_URL } from './health.service';
import { StatusPage } from './status-page';

// Every fixture goes through the contract's schema: an answer the API could never send fails here.
const up = (latencyMs: number, essential: boolean) => ({ status: 'up', latencyMs, essential });
const healthy: Health = healthSchema.parse({
  status: 'ok',
  version: '0.1.0',
  uptimeSeconds: 7530,
  dependencies: {
    database: up(3, true),
    jobQueue: up(4, true),
    objectStorage: up(12, false),
    mailRelay: up(8, false),
  },
});
const withDependency = (
  status: Health['status'],
  name: keyof Health['dependencies'],
  change: Partial<Health['dependencies'][typeof name]>,
): Health =>
  healthSchema.parse({
    ...healthy,
    status,
    dependencies: { ...healthy.dependencies, [name]: { ...healthy.dependencies[name], ...change } },
  });

describe('StatusPage', () => {
  let fixture: ComponentFixture<StatusPage>;
  let http: HttpTestingController;

  const el = (): HTMLElement => fixture.nativeElement as HTMLElement;
  const byTestId = (id: string): HTMLElement | null => el().querySelector(`[data-testid="${id}"]`);
  const text = (): string => (el().textContent ?? '').replace(/\s+/g, ' ');

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [StatusPage],
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StatusPage);
    // Runs the first render, which starts the health request.
    fixture.detectChanges();
  });

  afterEach(() => http.verify());

  it('while the server has not answered, shows a progress bar and says it is asking', () => {
    const req = http.expectOne(HEALTH_URL);
    expect(req.request.method).toBe('GET');

    expect(byTestId('status-loading')).not.toBeNull();
    expect(el().querySelector('mat-progress-bar')).not.toBeNull();
    expect(text()).toContain('Asking the Trabeate server');
    expect(byTestId('status-database')).toBeNull();
    reply(req, healthSchema, healthy);
  });

  it('when everything is up, shows the API and a row for each dependency with its status word', async () => {
    reply(http.expectOne(HEALTH_URL), healthSchema, healthy);
    await fixture.whenStable();

    expect(byTestId('status-loading')).toBeNull();
    expect(byTestId('api-status')?.textContent).toBe('ok');
    for (const name of ['database', 'jobQueue', 'objectStorage', 'mailRelay']) {
      expect(byTestId(`status-${name}`)?.textContent).toBe('up');
    }
    for (const label of ['API', 'Database', 'Job queue', 'File storage', 'Mail relay']) expect(text()).toContain(label);
    expect(text()).toContain('Everything is working.');
    // 7530 s = 2 h 5 min 30 s; latencies and version shown as sent.
    expect(text()).toContain('2 h 5 min');
    expect(text()).toContain('3 ms');
    expect(text()).toContain('12 ms');
    expect(text()).toContain('0.1.0');
  });

  it('when the server answers 503 because the database is down, shows "down", the reason and what stops', async () => {
    const down = withDependency('down', 'database', {
      status: 'down',
      latencyMs: null,
      message: 'The database did not answer within 1.5 s.',
    });
    reply(http.expectOne(HEALTH_URL), healthSchema, down, { status: 503, statusText: 'Service Unavailable' });
    await fixture.whenStable();

    expect(byTestId('status-error')).toBeNull();
    expect(byTestId('status-database')?.textContent).toBe('down');
    expect(byTestId('status-mailRelay')?.textContent).toBe('up');
    expect(byTestId('api-status')?.textContent).toBe('down');
    expect(byTestId('status-summary')?.textContent).toContain('The server cannot work: it cannot reach its database.');
    expect(text()).toContain('did not answer within 1.5 s');
    expect(text()).toContain('Nothing works without it.');
    // The down row has no latency; the rows that answered keep theirs.
    expect(byTestId('row-database')?.textContent).not.toContain(' ms');
    expect(byTestId('row-mailRelay')?.textContent).toContain('8 ms');
  });

  it('when file storage and the mail relay are down, says the server works and names both', async () => {
    const degraded = healthSchema.parse({
      ...healthy,
      status: 'degraded',
      dependencies: {
        ...healthy.dependencies,
        objectStorage: { status: 'down', latencyMs: null, essential: false, message: 'File storage did not answer.' },
        mailRelay: { status: 'down', latencyMs: null, essential: false },
      },
    });
    reply(http.expectOne(HEALTH_URL), healthSchema, degraded);
    await fixture.whenStable();

    expect(byTestId('status-summary')?.textContent).toContain(
      'The server is working, but it cannot reach its file storage and mail relay.',
    );
    expect(byTestId('status-objectStorage')?.textContent).toBe('down');
    expect(byTestId('status-mailRelay')?.textContent).toBe('down');
    expect(byTestId('status-database')?.textContent).toBe('up');
    expect(text()).toContain('files cannot be uploaded or downloaded');
    // The state is a word and an outline, not colour alone.
    const pill = byTestId('status-objectStorage')!.parentElement!;
    expect(pill.classList).toContain('is-bad');
    expect(pill.textContent?.trim()).toBe('down');
  });

  it('shows a dependency this server runs without as "not set up", not as a fault', async () => {
    reply(
      http.expectOne(HEALTH_URL),
      healthSchema,
      withDependency('ok', 'mailRelay', {
        status: 'not_configured',
        latencyMs: null,
        message: 'Not set up on this server.',
      }),
    );
    await fixture.whenStable();

    expect(byTestId('status-mailRelay')?.textContent).toBe('not set up');
    expect(byTestId('status-mailRelay')!.parentElement!.classList).toContain('is-off');
    expect(text()).toContain('Everything is working.');
  });

  it('when the server cannot be reached, explains it and a retry asks again and shows the answer', async () => {
    http.expectOne(HEALTH_URL).error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await fixture.whenStable();

    expect(byTestId('status-error')).not.toBeNull();
    expect(text()).toContain('The Trabeate server could not be reached');
    expect(byTestId('status-database')).toBeNull();

    const retry = byTestId('status-retry') as HTMLButtonElement;
    expect(retry.textContent).toContain('Try again');
    retry.click();
    fixture.detectChanges();

    const again = http.expectOne(HEALTH_URL);
    expect(byTestId('status-error')).toBeNull();
    expect(byTestId('status-loading')).not.toBeNull();
    reply(again, healthSchema, healthy);
    await fixture.whenStable();

    expect(byTestId('status-database')?.textContent).toBe('up');
  });

  it('when a proxy answers 504 for a server that is down, says the server could not be reached', async () => {
    // Not the API's answer: the proxy in front of it.
    http.expectOne(HEALTH_URL).flush('Gateway Timeout', { status: 504, statusText: 'Gateway Timeout' });
    await fixture.whenStable();

    expect(text()).toContain('The Trabeate server could not be reached');
  });

  it('when the server fails with 500, names the HTTP status instead of calling it unreachable', async () => {
    replyError(http.expectOne(HEALTH_URL), 500, { code: 'internal', message: 'Something went wrong on our side.' });
    await fixture.whenStable();

    expect(text()).toContain('answered with an error (HTTP 500)');
    expect(text()).not.toContain('could not be reached');
  });

  it('when the answer has the wrong shape, says so rather than showing made-up rows', async () => {
    // The shape this page used to take (one database part) is no longer an answer it accepts.
    http.expectOne(HEALTH_URL).flush({
      status: 'ok',
      version: '0.1.0',
      uptimeSeconds: 3,
      database: { status: 'up', latencyMs: 1 },
    });
    await fixture.whenStable();

    expect(byTestId('status-database')).toBeNull();
    expect(text()).toContain('not in a form this page understands');
  });

  it('"Check again" on a shown result asks the server again and shows the new answer', async () => {
    reply(http.expectOne(HEALTH_URL), healthSchema, healthy);
    await fixture.whenStable();

    const button = Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes('Check again'));
    expect(button).toBeDefined();
    button!.click();
    fixture.detectChanges();

    reply(
      http.expectOne(HEALTH_URL),
      healthSchema,
      withDependency('degraded', 'objectStorage', { status: 'down', latencyMs: null }),
    );
    await fixture.whenStable();
    expect(byTestId('status-objectStorage')?.textContent).toBe('down');
  });
});
