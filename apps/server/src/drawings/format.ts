// One date format across the app, mails and PDFs: "2 Dec 2026" (and "2 Dec 2026, 14:05" with a time).
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A calendar date (YYYY-MM-DD, or a Date read as UTC) as "2 Dec 2026". */
export function formatDay(value: string | Date): string {
  const iso = typeof value === 'string' ? value : value.toISOString();
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number);
  return `${d} ${MONTHS[m - 1]} ${y}`;
}

/** An instant as "2 Dec 2026, 14:05 UTC". */
export function formatInstant(value: Date): string {
  const hh = String(value.getUTCHours()).padStart(2, '0');
  const mm = String(value.getUTCMinutes()).padStart(2, '0');
  return `${formatDay(value)}, ${hh}:${mm} UTC`;
}

/** A transmittal's printed reference, e.g. SQ-2026-014-TR-003. */
export function transmittalReference(projectReference: string, n: number): string {
  return `${projectReference}-TR-${String(n).padStart(3, '0')}`;
}
