import type { RevisionScheme, RevisionSeries } from '@trabeate/contracts';

// Letters skip I and O so that a revision is never read as 1 or 0 on a print (common practice).
const LETTERS = 'ABCDEFGHJKLMNPQRSTUVWXYZ';

/**
 * The code of the n-th revision (1-based) of a series. iso19650: P01, P02 … while preliminary,
 * C01, C02 … once contractual. letters_numbers: A, B … (then AA, AB …) and 0, 1, 2 ….
 */
export function revisionCode(scheme: RevisionScheme, series: RevisionSeries, n: number): string {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`revision ordinal must be a positive integer, got ${n}`);
  if (scheme === 'iso19650') {
    if (n > 99) throw new RangeError('an ISO 19650 revision series stops at 99');
    return `${series === 'preliminary' ? 'P' : 'C'}${String(n).padStart(2, '0')}`;
  }
  if (series === 'contractual') return String(n - 1);
  let code = '';
  let k = n;
  while (k > 0) {
    const r = (k - 1) % LETTERS.length;
    code = LETTERS[r] + code;
    k = Math.floor((k - 1) / LETTERS.length);
  }
  return code;
}

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * The next drawing number for a firm's pattern ({project} and one {seq:N}): one more than the
 * highest sequence already used in the project by a number that fits the pattern.
 */
export function nextDrawingNumber(pattern: string, projectReference: string, existing: string[]): string {
  const seq = /\{seq:([1-6])\}/.exec(pattern);
  if (!seq) throw new Error(`pattern ${pattern} has no {seq:N}`);
  const width = Number(seq[1]);
  const [before, after] = pattern.split(seq[0]).map((part) => part.replaceAll('{project}', projectReference));
  const re = new RegExp(`^${escape(before)}(\\d{${width},})${escape(after)}$`, 'i');
  let max = 0;
  for (const number of existing) {
    const m = re.exec(number);
    if (m) max = Math.max(max, Number(m[1]));
  }
  return `${before}${String(max + 1).padStart(width, '0')}${after}`;
}
