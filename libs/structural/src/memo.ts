import type { BeamEnvelope } from './envelope';

interface Kept {
  nums: Float64Array;
  env: BeamEnvelope;
  /** the newest analysis (by count) that used it */
  usedIn: number;
}

/**
 * Beam-line envelopes kept from one analysis of a scheme to the next, for a caller that analyses
 * the same scheme again and again as it is edited (the planning page's worker). Moving one column
 * changes the beam lines through it and the slabs beside it; every other line has the same spans,
 * stiffness and loads as before, so its envelope is taken from here instead of being computed
 * again. The key is the whole input of the envelope (see analyse.ts, envelopeKey): its words
 * (span ids and kinds, supports, combinations) and its numbers (lengths, stiffness, loads), both
 * compared in full, so a kept envelope is only ever used for exactly the input it came from.
 *
 * Kept: the envelopes used by the newest `keep` analyses (default 2, so an edit and its undo both
 * find theirs). The engine never changes a kept envelope: two results may share one.
 */
export class EngineMemo {
  private readonly kept = new Map<string, Kept[]>();
  private run = 0;
  /** envelopes taken from the memo and computed, in the newest analysis */
  readonly last = { reused: 0, computed: 0 };

  constructor(private readonly keep = 2) {}

  /** Called by the engine at the start of an analysis. */
  begin(): void {
    this.run++;
    this.last.reused = 0;
    this.last.computed = 0;
  }

  /** The envelope for this input: the kept one, or the one `compute` gives (then kept). */
  envelope(words: string, nums: Float64Array, compute: () => BeamEnvelope): BeamEnvelope {
    let bucket = this.kept.get(words);
    if (!bucket) {
      bucket = [];
      this.kept.set(words, bucket);
    }
    for (const k of bucket)
      if (sameNumbers(k.nums, nums)) {
        k.usedIn = this.run;
        this.last.reused++;
        return k.env;
      }
    this.last.computed++;
    const env = compute();
    bucket.push({ nums, env, usedIn: this.run });
    return env;
  }

  /** Called by the engine at the end of an analysis: forgets envelopes no recent analysis used. */
  end(): void {
    const oldest = this.run - this.keep + 1;
    for (const [words, bucket] of this.kept) {
      const live = bucket.filter((k) => k.usedIn >= oldest);
      if (live.length === 0) this.kept.delete(words);
      else if (live.length < bucket.length) this.kept.set(words, live);
    }
  }

  /** How many envelopes are kept now. */
  get size(): number {
    let n = 0;
    for (const b of this.kept.values()) n += b.length;
    return n;
  }
}

function sameNumbers(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  // NaN never reaches here (the scheme is validated); -0 and 0 give the same envelope
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
