import { formatDay as sharedFormatDay } from '@trabeate/dates';
// Money on screen: amounts travel as integer minor units and are formatted only here, with
// Intl.NumberFormat for the invoice's own currency (its exponent: EUR 2, JPY 0).
const LOCALE = 'en-GB';

export function currencyDigits(currency: string): number {
  return new Intl.NumberFormat(LOCALE, { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

export function formatMinor(minor: number, currency: string): string {
  return new Intl.NumberFormat(LOCALE, { style: 'currency', currency }).format(minor / 10 ** currencyDigits(currency));
}

/**
 * What a person typed ("1 250.50", "1,250.5") as minor units, or null when it is not an amount
 * in this currency (too many decimals, letters). Parsed from the digits, never through a float.
 */
export function parseMajor(text: string, currency: string): number | null {
  const digits = currencyDigits(currency);
  const clean = text.replace(/[\s,]/g, '');
  const m = /^(\d{1,13})(?:\.(\d*))?$/.exec(clean);
  if (!m || (m[2] ?? '').length > digits) return null;
  return Number(m[1]) * 10 ** digits + Number((m[2] ?? '').padEnd(digits, '0') || '0');
}

/** A calendar day in the app's one date format ("2 Dec 2026", libs/dates), or a dash for none. */
export function formatDay(iso: string | null): string {
  return iso ? sharedFormatDay(iso) || '—' : '—';
}
