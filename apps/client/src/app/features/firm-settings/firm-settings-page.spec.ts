import { LiveAnnouncer } from '@angular/cdk/a11y';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { firmDateSettingsSchema, meSchema } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { grantedMe } from '../../core/auth/testing';
import { FirmSettingsPage } from './firm-settings-page';

describe('FirmSettingsPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  let announced: string[];
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };
  const field = (name: string) => el().querySelector(`input[formcontrolname="${name}"]`) as HTMLInputElement;
  const type = async (name: string, value: string) => {
    field(name).value = value;
    field(name).dispatchEvent(new Event('input'));
    await settle();
  };
  const text = (testid: string) => el().querySelector(`[data-testid="${testid}"]`)?.textContent?.trim() ?? '';
  const save = () => (el().querySelector('[data-testid="save-firm-dates"]') as HTMLButtonElement).click();

  async function open(stored = { dateLocale: 'en-GB', timeZone: 'Europe/London' }): Promise<void> {
    announced = [];
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'firm/settings', component: FirmSettingsPage }]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: LiveAnnouncer, useValue: { announce: async (m: string) => void announced.push(m) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl('/firm/settings');
    await settle();
    expect(el().textContent).toContain("Loading the firm's settings");
    reply(backend.expectOne('/api/firm-settings'), firmDateSettingsSchema, stored);
    await settle();
  }

  afterEach(() => backend.verify());

  it('fills the form from the stored settings and shows how a time will read', async () => {
    await open({ dateLocale: 'en-IN', timeZone: 'Asia/Kolkata' });
    expect(field('dateLocale').value).toBe('en-IN');
    expect(field('timeZone').value).toBe('Asia/Kolkata');
    // 14:05 UTC is 19:35 India Standard Time (UTC+5:30, IANA tz database); en-IN calls it IST.
    expect(text('preview')).toContain('20 Dec 2026, 19:35 IST');
  });

  it('says what is wrong with a locale or a zone as it is typed, and the example waits for both', async () => {
    await open();
    await type('dateLocale', 'en_GB');
    expect(text('locale-error')).toContain('language tag');
    expect(text('preview')).toContain('appears once both fields are right');
    await type('dateLocale', 'de-DE');
    expect(text('locale-error')).toBe('');
    await type('timeZone', 'Mars/Olympus');
    expect(text('zone-error')).toContain('IANA time zone');
    await type('timeZone', 'Europe/Berlin');
    // Central European Time, UTC+1 in December.
    expect(text('preview')).toContain('20. Dez. 2026, 15:05');
  });

  it('after a failed save, focus moves to the first field in error and the count is shown and announced', async () => {
    await open();
    await type('dateLocale', '');
    await type('timeZone', 'Nowhere/Atall');
    (document.activeElement as HTMLElement | null)?.blur();
    save();
    await settle();
    expect(document.activeElement).toBe(field('dateLocale'));
    expect(text('error-count')).toBe('2 fields need attention.');
    expect(announced).toEqual(['2 fields need attention.']);
    backend.expectNone('/api/firm-settings');
  });

  it('saves trimmed values once, even when clicked twice, then reads the session again so screens follow', async () => {
    await open();
    await type('dateLocale', '  en-US ');
    await type('timeZone', 'America/New_York');
    save();
    save();
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/firm-settings' });
    expect(put.request.body).toEqual({ dateLocale: 'en-US', timeZone: 'America/New_York' });
    reply(put, firmDateSettingsSchema, { dateLocale: 'en-US', timeZone: 'America/New_York' });
    await settle();
    const me = grantedMe('principal');
    reply(backend.expectOne('/api/me'), meSchema, {
      ...me,
      firm: { ...me.firm, dateLocale: 'en-US', timeZone: 'America/New_York' },
    });
    await settle();
    expect(text('form-error')).toBe('');
  });

  it("puts the server's field messages on the fields they belong to", async () => {
    await open();
    await type('timeZone', 'Asia/Kolkata');
    save();
    await settle();
    replyError(backend.expectOne({ method: 'PUT', url: '/api/firm-settings' }), 400, {
      code: 'validation_failed',
      message: 'Invalid body.timeZone',
      fields: { 'body.timeZone': ['not an IANA time zone (for example Europe/London, Asia/Kolkata)'] },
    });
    await settle();
    expect(text('zone-error')).toBe('not an IANA time zone (for example Europe/London, Asia/Kolkata)');
  });
});
