import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { DateAdapter, MAT_NATIVE_DATE_FORMATS } from '@angular/material/core';
import { meSchema } from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { DayPipe, DayTimePipe } from './app-dates';
import { provideFirmDates, toIsoDay } from './firm-date-adapter';

@Component({
  selector: 'tb-dates-probe',
  imports: [DayPipe, DayTimePipe],
  template: `<span data-testid="day">{{ day() | tbDay }}</span
    ><span data-testid="at">{{ at() | tbDayTime }}</span>`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class DatesProbe {
  readonly day = input('2026-12-20');
  readonly at = input('2026-12-01T20:00:00.000Z');
}

describe("screen dates follow the firm's settings from /api/me", () => {
  let backend: HttpTestingController;

  async function signedInWith(dateLocale: string, timeZone: string, beforeRender = () => {}) {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideFirmDates()],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    const me = grantedMe('engineer');
    reply(backend.expectOne('/api/me'), meSchema, { ...me, firm: { ...me.firm, dateLocale, timeZone } });
    await loaded;
    beforeRender();
    const fixture = TestBed.createComponent(DatesProbe);
    fixture.detectChanges();
    const text = (id: string) =>
      (fixture.nativeElement as HTMLElement).querySelector(`[data-testid="${id}"]`)!.textContent;
    return { text, adapter: TestBed.inject(DateAdapter<Date>) };
  }

  afterEach(() => backend.verify());

  it('writes an instant in the firm zone: 20:00 UTC is 01:30 the next day in Kolkata', async () => {
    // India Standard Time is UTC+5:30 all year (IANA tz database, Asia/Kolkata).
    const { text } = await signedInWith('en-IN', 'Asia/Kolkata');
    expect(text('at')).toBe('2 Dec 2026, 01:30');
    // A calendar day is that day in any zone.
    expect(text('day')).toBe('20 Dec 2026');
  });

  it('writes the same instant as 20:00 for a firm in London (GMT in December)', async () => {
    const { text } = await signedInWith('en-GB', 'Europe/London');
    expect(text('at')).toBe('1 Dec 2026, 20:00');
  });

  it('writes days, and date fields read and write, in the firm locale', async () => {
    const { text, adapter } = await signedInWith('de-DE', 'Europe/Berlin');
    expect(text('day')).toBe('20. Dez. 2026');
    expect(text('at')).toBe('1. Dez. 2026, 21:00');
    expect(adapter.format(new Date(2026, 11, 20), MAT_NATIVE_DATE_FORMATS.display.dateInput)).toBe('20. Dez. 2026');
    expect(toIsoDay(adapter.parse('20.12.2026', null))).toBe('2026-12-20');
  });

  it('date fields follow a change of settings without a reload (the principal saved new ones)', async () => {
    const { adapter } = await signedInWith('en-GB', 'Europe/London');
    expect(toIsoDay(adapter.parse('12/11/2026', null))).toBe('2026-11-12');
    const loaded = TestBed.inject(Session).reload();
    const me = grantedMe('engineer');
    reply(backend.expectOne('/api/me'), meSchema, {
      ...me,
      firm: { ...me.firm, dateLocale: 'en-US', timeZone: 'America/New_York' },
    });
    await loaded;
    expect(toIsoDay(adapter.parse('12/11/2026', null))).toBe('2026-12-11');
    expect(adapter.getMonthNames('long')[0]).toBe('January');
  });

  it("falls back to en-GB in London where this browser does not know the firm's zone, instead of failing", async () => {
    // An older browser whose tz data lacks the zone: its list is all this browser would know.
    let list: jest.SpyInstance | undefined;
    try {
      const { text } = await signedInWith('en-IN', 'Asia/Kolkata', () => {
        list = jest.spyOn(Intl, 'supportedValuesOf').mockReturnValue(['Europe/London', 'UTC']);
      });
      expect(text('at')).toBe('1 Dec 2026, 20:00');
    } finally {
      list?.mockRestore();
    }
  });
});
