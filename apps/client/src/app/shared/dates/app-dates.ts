import { InjectionToken, Pipe, PipeTransform, inject, type Provider } from '@angular/core';
import {
  DEFAULT_FIRM_DATES,
  formatDay,
  formatDayTime,
  isSupportedLocale,
  isSupportedTimeZone,
  waitedFor,
  type FirmDateSettings,
} from '@trabeate/dates';
import { Session } from '../../core/auth/session';

/**
 * The firm's date language (its locale and IANA time zone), read when a date is written: it comes
 * with GET /api/me, which the guards wait for before any page is drawn, and changes when the
 * principal saves new settings (the session is read again). en-GB in Europe/London until then, and
 * where this browser's Intl lacks the firm's locale or zone (an older browser's tz data): a
 * RangeError there would blank every page with a date on it.
 */
export const FIRM_DATES = new InjectionToken<() => FirmDateSettings>('FIRM_DATES', {
  factory: () => {
    const session = inject(Session);
    let seen: FirmDateSettings | null = null;
    let usable = DEFAULT_FIRM_DATES;
    return () => {
      const firm = session.firm();
      if (firm !== seen) {
        // Checked once per settings read, not on every date written.
        seen = firm;
        usable =
          firm && isSupportedLocale(firm.dateLocale) && isSupportedTimeZone(firm.timeZone)
            ? { dateLocale: firm.dateLocale, timeZone: firm.timeZone }
            : DEFAULT_FIRM_DATES;
      }
      return usable;
    };
  },
});

/** Fixed settings, for specs and for pages shown before anyone signs in. */
export function provideFirmDateSettings(settings: Partial<FirmDateSettings>): Provider {
  const fixed = { ...DEFAULT_FIRM_DATES, ...settings };
  return { provide: FIRM_DATES, useValue: () => fixed };
}

/** `{{ stage.dueDate | tbDay }}` → "20 Dec 2026". The only way screens write a calendar day. */
@Pipe({ name: 'tbDay' })
export class DayPipe implements PipeTransform {
  private readonly firm = inject(FIRM_DATES);
  transform(value: string | Date | null | undefined): string {
    const { dateLocale, timeZone } = this.firm();
    // A calendar day stays that day; an instant is the day it was where the firm is.
    return formatDay(value, { locale: dateLocale, timeZone });
  }
}

/** `{{ a.at | tbDayTime }}` → "20 Dec 2026, 14:05". The only way screens write an instant: in the firm's zone. */
@Pipe({ name: 'tbDayTime' })
export class DayTimePipe implements PipeTransform {
  private readonly firm = inject(FIRM_DATES);
  transform(value: string | Date | null | undefined): string {
    const { dateLocale, timeZone } = this.firm();
    return formatDayTime(value, { locale: dateLocale, timeZone });
  }
}

/** `{{ s.submittedAt | tbWaited }}` → "3 days". Impure-free: recomputed when the value changes. */
@Pipe({ name: 'tbWaited' })
export class WaitedPipe implements PipeTransform {
  transform(value: string | null | undefined): string {
    return value ? waitedFor(value) : '';
  }
}
