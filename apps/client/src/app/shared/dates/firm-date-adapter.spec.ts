import { TestBed } from '@angular/core/testing';
import { DateAdapter, MAT_NATIVE_DATE_FORMATS } from '@angular/material/core';
import { provideFirmDateSettings } from './app-dates';
import { fromIsoDay, provideFirmDates, toIsoDay } from './firm-date-adapter';

describe('date fields in the firm locale', () => {
  const adapter = (locale?: string) => {
    TestBed.resetTestingModule();
    TestBed.configureTestingModule({
      providers: [provideFirmDates(), ...(locale ? [provideFirmDateSettings({ dateLocale: locale })] : [])],
    });
    return TestBed.inject(DateAdapter<Date>);
  };

  it('shows a picked day in the one app format, not the browser locale', () => {
    expect(adapter().format(new Date(2026, 11, 20), MAT_NATIVE_DATE_FORMATS.display.dateInput)).toBe('20 Dec 2026');
  });

  it('reads day-first numbers in en-GB, the app format, full month names and ISO days', () => {
    const a = adapter();
    for (const typed of ['20/12/2026', '20.12.2026', '20 Dec 2026', '20 december 2026', '2026-12-20']) {
      expect(toIsoDay(a.parse(typed, null))).toBe('2026-12-20');
    }
  });

  it('reads month-first numbers where the firm locale writes them that way', () => {
    expect(toIsoDay(adapter('en-US').parse('12/20/2026', null))).toBe('2026-12-20');
  });

  it('refuses a day that does not exist, and treats an empty field as no date', () => {
    const a = adapter();
    expect(a.isValid(a.parse('31/02/2026', null)!)).toBe(false);
    expect(a.isValid(a.parse('next week', null)!)).toBe(false);
    expect(a.parse('  ', null)).toBeNull();
  });

  it('turns API calendar days into picker dates and back without shifting a day', () => {
    expect(toIsoDay(fromIsoDay('2026-03-29'))).toBe('2026-03-29');
    expect(fromIsoDay(null)).toBeNull();
  });
});
