// The one way Trabeate writes dates and times, shared by the client, the e-mails and PDFs, so a
// person never meets "12/20/2026" on one screen and "2026-12-20" on the next. It follows the
// firm's locale (default en-GB); the shape (day, short month, year; 24-hour time) stays the same.

export const DEFAULT_LOCALE = 'en-GB';

/**
 * The firm's zone until the principal sets one: the local time of the default locale's country,
 * so a firm that never opens its settings reads times as its clock shows them (GMT in winter,
 * BST in summer), not UTC.
 */
export const DEFAULT_TIME_ZONE = 'Europe/London';

/** What a firm's dates follow: a BCP 47 locale and an IANA time zone. */
export interface FirmDateSettings {
  dateLocale: string;
  timeZone: string;
}

export const DEFAULT_FIRM_DATES: FirmDateSettings = { dateLocale: DEFAULT_LOCALE, timeZone: DEFAULT_TIME_ZONE };

/** A well-formed BCP 47 tag that this runtime's Intl has date data for ("en-GB", "hi-IN"). */
export function isSupportedLocale(tag: string): boolean {
  try {
    return tag.trim() === tag && tag !== '' && Intl.DateTimeFormat.supportedLocalesOf([tag]).length === 1;
  } catch {
    return false; // malformed ("en_GB")
  }
}

/**
 * A zone Intl.supportedValuesOf('timeZone') lists, or one of its other IANA names: ICU lists one
 * name per zone (Node 20 and Chrome list "Asia/Calcutta", Firefox "Asia/Kolkata"), and "UTC" is
 * not listed at all, though every runtime formats in it.
 */
export function isSupportedTimeZone(zone: string): boolean {
  if (zone.trim() !== zone || zone === '') return false;
  const listed = new Set(Intl.supportedValuesOf('timeZone'));
  if (listed.has(zone)) return true;
  try {
    const canonical = new Intl.DateTimeFormat('en', { timeZone: zone }).resolvedOptions().timeZone;
    return listed.has(canonical) || canonical === 'UTC';
  } catch {
    return false; // not a zone at all
  }
}

/** "GMT", "BST", "GMT+5:30", "UTC": the zone an instant is written in, as the locale names it. */
export function zoneLabel(value: Date, opts: { locale?: string; timeZone: string }): string {
  return (
    new Intl.DateTimeFormat(opts.locale ?? DEFAULT_LOCALE, { timeZone: opts.timeZone, timeZoneName: 'short' })
      .formatToParts(value)
      .find((p) => p.type === 'timeZoneName')?.value ?? opts.timeZone
  );
}

const DAY_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/;

export interface DateFormatOptions {
  locale?: string;
  /** IANA zone for instants; omitted means the runtime's own (the browser's, on screen). */
  timeZone?: string;
}

function instant(value: string | Date): { date: Date; dayOnly: boolean } | null {
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? null : { date: value, dayOnly: false };
  const day = DAY_ONLY.exec(value);
  // A calendar day has no time zone: read it as that day in UTC and write it in UTC, so it never
  // slips to the day before for someone west of Greenwich.
  if (day) return { date: new Date(Date.UTC(+day[1], +day[2] - 1, +day[3])), dayOnly: true };
  const date = new Date(value);
  return Number.isNaN(date.getTime()) ? null : { date, dayOnly: false };
}

/** "20 Dec 2026" (en-GB). Takes a calendar day (YYYY-MM-DD), an ISO instant or a Date; '' for nothing. */
export function formatDay(value: string | Date | null | undefined, opts: DateFormatOptions = {}): string {
  const v = value == null || value === '' ? null : instant(value);
  if (!v) return '';
  return new Intl.DateTimeFormat(opts.locale ?? DEFAULT_LOCALE, {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    timeZone: v.dayOnly ? 'UTC' : opts.timeZone,
  }).format(v.date);
}

/** "20 Dec 2026, 14:05" (en-GB): the day as formatDay writes it, then a 24-hour time. */
export function formatDayTime(value: string | Date | null | undefined, opts: DateFormatOptions = {}): string {
  const v = value == null || value === '' ? null : instant(value);
  if (!v) return '';
  if (v.dayOnly) return formatDay(value, opts);
  const time = new Intl.DateTimeFormat(opts.locale ?? DEFAULT_LOCALE, {
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZone: opts.timeZone,
  }).format(v.date);
  return `${formatDay(v.date, opts)}, ${time}`;
}

/** Whole days from one instant to another, rounded down (never negative): "how long has this waited". */
export function daysBetween(from: string | Date, to: Date = new Date()): number {
  const a = typeof from === 'string' ? new Date(from) : from;
  return Math.max(0, Math.floor((to.getTime() - a.getTime()) / 86_400_000));
}

/** "under a day", "1 day", "12 days": how long something has waited. */
export function waitedFor(from: string | Date, to: Date = new Date()): string {
  const d = daysBetween(from, to);
  return d === 0 ? 'under a day' : d === 1 ? '1 day' : `${d} days`;
}
