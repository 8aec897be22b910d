import { daysBetween, formatDay, formatDayTime, waitedFor } from './dates';

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
