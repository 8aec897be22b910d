// Money arithmetic on integer minor units. Products of an amount and a rate can pass 2^53, so the
// multiplication runs in BigInt and only the rounded result comes back as a number.

/** amount × rateBp / 10 000, rounded half away from zero to a whole minor unit (half up for positives). */
export function applyRate(amountMinor: number, rateBp: number): number {
  if (!Number.isSafeInteger(amountMinor) || !Number.isSafeInteger(rateBp)) {
    throw new RangeError('amounts and rates are whole numbers of minor units and basis points');
  }
  const negative = amountMinor < 0;
  const product = BigInt(Math.abs(amountMinor)) * BigInt(rateBp);
  const rounded = (product + 5_000n) / 10_000n;
  const result = Number(rounded);
  return negative ? -result : result;
}

/** One line's tax, rounded on the line; an invoice's totals are the sums of rounded lines. */
export function lineTax(netMinor: number, taxRateBp: number): number {
  return applyRate(netMinor, taxRateBp);
}

export interface Totals {
  subtotalMinor: number;
  taxMinor: number;
  totalMinor: number;
}

export function totalsOf(lines: Array<{ netMinor: number; taxMinor: number }>): Totals {
  const subtotalMinor = lines.reduce((s, l) => s + l.netMinor, 0);
  const taxMinor = lines.reduce((s, l) => s + l.taxMinor, 0);
  return { subtotalMinor, taxMinor, totalMinor: subtotalMinor + taxMinor };
}

/**
 * Each stage's part of a fee, by cumulative rounding: stage i gets round(fee × shares up to i) −
 * round(fee × shares before i). The parts then add up to the fee exactly, with no stray minor unit.
 */
export function splitFee(feeMinor: number, sharesBp: number[]): number[] {
  let before = 0;
  let cumulative = 0;
  return sharesBp.map((bp) => {
    cumulative += bp;
    const upTo = applyRate(feeMinor, cumulative);
    const part = upTo - before;
    before = upTo;
    return part;
  });
}

/** The number of decimals a currency's minor unit has (JPY 0, EUR 2, BHD 3). */
export function currencyExponent(currency: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Formats minor units for people (PDFs, mails) with the currency's own exponent. */
export function formatMoney(minor: number, currency: string, locale = 'en-GB'): string {
  const exponent = currencyExponent(currency);
  return new Intl.NumberFormat(locale, { style: 'currency', currency }).format(minor / 10 ** exponent);
}
