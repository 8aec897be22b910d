import { Injectable, inject, type Provider } from '@angular/core';
import {
  DateAdapter,
  MAT_DATE_FORMATS,
  MAT_DATE_LOCALE,
  MAT_NATIVE_DATE_FORMATS,
  NativeDateAdapter,
} from '@angular/material/core';
import { formatDay } from '@trabeate/dates';
import { FIRM_DATES } from './app-dates';

/** A Date picked in the calendar (local midnight) as the API's calendar day, YYYY-MM-DD. */
export function toIsoDay(d: Date | null | undefined): string {
  if (!d || Number.isNaN(d.getTime())) return '';
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}`;
}

/** The API's calendar day as a local-midnight Date for the picker; null for none. */
export function fromIsoDay(v: string | null | undefined): Date | null {
  const m = v ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(v) : null;
  return m ? new Date(+m[1], +m[2] - 1, +m[3]) : null;
}

/**
 * Date fields write the app's one format ("20 Dec 2026") and read what people type in the firm's
 * locale: "20/12/2026" (day and month in the locale's order), "20 Dec 2026", "20 December 2026" or
 * "2026-12-20". The browser's own date input would show the browser's locale instead.
 */
@Injectable()
export class FirmDateAdapter extends NativeDateAdapter {
  private readonly firmDates = inject(FIRM_DATES);

  /** The firm's locale now (the principal may change it while the app is open). */
  private get firmLocale(): string {
    const locale = this.firmDates().dateLocale;
    if (this.locale !== locale) this.setLocale(locale);
    return locale;
  }

  override getMonthNames(style: 'long' | 'short' | 'narrow'): string[] {
    void this.firmLocale;
    return super.getMonthNames(style);
  }

  override getDayOfWeekNames(style: 'long' | 'short' | 'narrow'): string[] {
    void this.firmLocale;
    return super.getDayOfWeekNames(style);
  }

  override format(date: Date, displayFormat: object): string {
    void this.firmLocale;
    if (displayFormat === MAT_NATIVE_DATE_FORMATS.display.dateInput) {
      return formatDay(toIsoDay(date), { locale: this.firmLocale });
    }
    return super.format(date, displayFormat);
  }

  override parse(value: unknown, parseFormat?: unknown): Date | null {
    if (value instanceof Date || typeof value === 'number') return super.parse(value, parseFormat);
    if (typeof value !== 'string' || value.trim() === '') return null;
    const text = value.trim();
    const iso = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(text);
    if (iso) return this.day(+iso[1], +iso[2], +iso[3]);
    const numeric = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})$/.exec(text);
    if (numeric) {
      const dayFirst = this.dayBeforeMonth();
      const [d, m] = dayFirst ? [+numeric[1], +numeric[2]] : [+numeric[2], +numeric[1]];
      return this.day(+numeric[3], m, d);
    }
    const named = /^(\d{1,2})\.?\s+([^\s\d]+?)\.?,?\s+(\d{4})$/.exec(text);
    if (named) {
      const word = named[2].toLocaleLowerCase(this.firmLocale);
      const index = [this.getMonthNames('long'), this.getMonthNames('short')]
        .map((names) => names.findIndex((n) => n.toLocaleLowerCase(this.firmLocale).replace(/\.$/, '') === word))
        .find((i) => i >= 0);
      if (index !== undefined) return this.day(+named[3], index + 1, +named[1]);
    }
    return this.invalid();
  }

  /** A real calendar day or an invalid date (31 Feb is not quietly 3 Mar). */
  private day(y: number, m: number, d: number): Date {
    const date = new Date(y, m - 1, d);
    return date.getFullYear() === y && date.getMonth() === m - 1 && date.getDate() === d ? date : this.invalid();
  }

  private dayBeforeMonth(): boolean {
    const types = new Intl.DateTimeFormat(this.firmLocale).formatToParts(new Date(2026, 11, 20)).map((p) => p.type);
    return types.indexOf('day') < types.indexOf('month');
  }
}

/** Date pickers in the firm's locale and the app's one format; in app.config.ts. */
export function provideFirmDates(): Provider[] {
  return [
    { provide: MAT_DATE_LOCALE, useFactory: () => inject(FIRM_DATES)().dateLocale },
    { provide: DateAdapter, useClass: FirmDateAdapter },
    { provide: MAT_DATE_FORMATS, useValue: MAT_NATIVE_DATE_FORMATS },
  ];
}
