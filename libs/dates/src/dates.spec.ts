import {
  daysBetween,
  formatDay,
  formatDayTime,
  isSupportedLocale,
  isSupportedTimeZone,
  waitedFor,
  zoneLabel,
} from './dates';

describe('one date and time format', () => {
  it('writes a calendar day as day, short month and year in en-GB by default', () => {
    expect(formatDay('2026-12-20')).toBe('20 Dec 2026');
  });

  it('never moves a calendar day to the day before, whatever the time zone', () => {
    expect(formatDay('2026-01-01', { timeZone: 'America/Los_Angeles' })).toBe('1 Jan 2026');
  });

  it('writes an instant as the same day format followed by a 24-hour time', () => {
    expect(formatDayTime('2026-12-20T14:05:00.000Z', { timeZone: 'UTC' })).toBe('20 Dec 2026, 14:05');
    expect(formatDayTime('2026-12-20T23:30:00.000Z', { timeZone: 'Europe/Berlin' })).toBe('21 Dec 2026, 00:30');
  });

  it('follows the firm locale when one is set', () => {
    expect(formatDay('2026-12-20', { locale: 'de-DE' })).toBe('20. Dez. 2026');
  });

  it('writes nothing for a missing or unreadable value rather than "Invalid Date"', () => {
    expect(formatDay(null)).toBe('');
    expect(formatDayTime('not a date')).toBe('');
  });

  it('counts whole days waited, never negative', () => {
    const now = new Date('2026-12-20T12:00:00Z');
    expect(daysBetween('2026-12-17T13:00:00Z', now)).toBe(2);
    expect(daysBetween('2026-12-21T12:00:00Z', now)).toBe(0);
    expect(waitedFor('2026-12-20T08:00:00Z', now)).toBe('under a day');
    expect(waitedFor('2026-12-19T08:00:00Z', now)).toBe('1 day');
    expect(waitedFor('2026-12-10T08:00:00Z', now)).toBe('10 days');
  });
});

describe("a firm's date settings", () => {
  it('accepts locales Intl has date data for and refuses malformed or unknown tags', () => {
    for (const ok of ['en-GB', 'en-US', 'de-DE', 'hi-IN']) expect(isSupportedLocale(ok)).toBe(true);
    for (const bad of ['en_GB', 'zz', 'xx-YY', '', ' en-GB', 'not a locale'])
      expect(isSupportedLocale(bad)).toBe(false);
  });

  it('accepts IANA zones under either of their names, and UTC; refuses the rest', () => {
    // IANA tz database: Asia/Kolkata is the current name, Asia/Calcutta its older link.
    for (const ok of ['Europe/London', 'Asia/Kolkata', 'Asia/Calcutta', 'America/New_York', 'UTC']) {
      expect(isSupportedTimeZone(ok)).toBe(true);
    }
    for (const bad of ['Mars/Olympus', 'GMT+25', '', 'europe london', ' UTC'])
      expect(isSupportedTimeZone(bad)).toBe(false);
  });

  it('names the zone an instant is written in: India is UTC+5:30 all year (no daylight saving)', () => {
    const at = new Date('2026-12-01T09:05:00Z');
    expect(formatDayTime(at, { timeZone: 'Asia/Kolkata' })).toBe('1 Dec 2026, 14:35');
    expect(zoneLabel(at, { timeZone: 'Asia/Kolkata' })).toBe('GMT+5:30');
    expect(zoneLabel(at, { timeZone: 'Europe/London' })).toBe('GMT');
    expect(zoneLabel(new Date('2026-07-01T09:05:00Z'), { timeZone: 'Europe/London' })).toBe('BST');
    expect(zoneLabel(at, { timeZone: 'UTC' })).toBe('UTC');
  });
});
