import { healthSchema, type Health } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HEALTH_URL } from './health.service';
import { StatusPage } from './status-page';

const healthy: Health = {
  status: 'ok',
  version: '0.1.0',
  uptimeSeconds: 7530,
  database: { status: 'up', latencyMs: 3 },
};

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
    expect(byTestId('db-status')).toBeNull();
    reply(req, healthSchema, healthy);
  });

  it('when the database is up, shows the API and Database rows with their status words', async () => {
    reply(http.expectOne(HEALTH_URL), healthSchema, healthy);
    await fixture.whenStable();

    expect(byTestId('status-loading')).toBeNull();
    expect(byTestId('db-status')?.textContent).toBe('up');
    expect(byTestId('api-status')?.textContent).toBe('ok');
    expect(text()).toContain('Database');
    expect(text()).toContain('API');
    expect(text()).toContain('Everything is working.');
    // 7530 s = 2 h 5 min 30 s; latency and version shown as sent.
    expect(text()).toContain('2 h 5 min');
    expect(text()).toContain('3 ms');
    expect(text()).toContain('0.1.0');
  });

  it('when the server answers 503 with its health saying the database is down, shows "down" and the reason', async () => {
    const degraded: Health = {
      status: 'degraded',
      version: '0.1.0',
      uptimeSeconds: 40,
      database: { status: 'down', latencyMs: null, message: 'connection refused' },
    };
    reply(http.expectOne(HEALTH_URL), healthSchema, degraded, { status: 503, statusText: 'Service Unavailable' });
    await fixture.whenStable();

    expect(byTestId('status-error')).toBeNull();
    expect(byTestId('db-status')?.textContent).toBe('down');
    expect(byTestId('api-status')?.textContent).toBe('degraded');
    expect(text()).toContain('cannot reach its database');
    expect(text()).toContain('connection refused');
    expect(text()).not.toContain(' ms');
  });

  it('when the server cannot be reached, explains it and a retry asks again and shows the answer', async () => {
    http.expectOne(HEALTH_URL).error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await fixture.whenStable();

    expect(byTestId('status-error')).not.toBeNull();
    expect(text()).toContain('The Trabeate server could not be reached');
    expect(byTestId('db-status')).toBeNull();

    const retry = byTestId('status-retry') as HTMLButtonElement;
    expect(retry.textContent).toContain('Try again');
    retry.click();
    fixture.detectChanges();

    const again = http.expectOne(HEALTH_URL);
    expect(byTestId('status-error')).toBeNull();
    expect(byTestId('status-loading')).not.toBeNull();
    reply(again, healthSchema, healthy);
    await fixture.whenStable();

    expect(byTestId('db-status')?.textContent).toBe('up');
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
    // Deliberately not the contract's shape: this is what the page must refuse to show.
    http.expectOne(HEALTH_URL).flush({ status: 'ok', version: '0.1.0' });
    await fixture.whenStable();

    expect(byTestId('db-status')).toBeNull();
    expect(text()).toContain('not in a form this page understands');
  });

  it('"Check again" on a shown result asks the server again and shows the new answer', async () => {
    reply(http.expectOne(HEALTH_URL), healthSchema, healthy);
    await fixture.whenStable();

    const button = Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes('Check again'));
    expect(button).toBeDefined();
    button!.click();
    fixture.detectChanges();

    reply(http.expectOne(HEALTH_URL), healthSchema, { ...healthy, database: { status: 'down', latencyMs: null } });
    await fixture.whenStable();
    expect(byTestId('db-status')?.textContent).toBe('down');
  });
});
