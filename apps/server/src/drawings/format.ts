import { DEFAULT_LOCALE } from '@trabeate/dates';
import { printDayTime } from '../look/print-look';

/**
 * An instant where no firm is known yet (a signed link refused before anything is looked up):
 * "2 Dec 2026, 14:05 UTC". Everywhere else dates follow the firm (look/print-look.ts).
 */
export function formatInstant(value: Date): string {
  return printDayTime(value, { dateLocale: DEFAULT_LOCALE, timeZone: 'UTC' });
}

/** A transmittal's printed reference, e.g. SQ-2026-014-TR-003. */
export function transmittalReference(projectReference: string, n: number): string {
  return `${projectReference}-TR-${String(n).padStart(3, '0')}`;
}
