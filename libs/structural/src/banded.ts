// Symmetric banded LDLᵀ factorisation. A continuous beam with two degrees of freedom per node
// couples each unknown to at most three neighbours, so the work is O(n·b²) instead of the
// O(n³) of a dense solve and the storage is O(n·b).

/** A symmetric matrix stored as its lower band: entry (i, i - k) at a[i * (hb + 1) + k]. */
export interface BandMatrix {
  n: number;
  /** half-bandwidth: entries with |i - j| > hb are zero */
  hb: number;
  a: Float64Array;
}

export function bandMatrix(n: number, hb: number): BandMatrix {
  return { n, hb, a: new Float64Array(n * (hb + 1)) };
}

/** Adds v to entry (i, j) and, by symmetry, (j, i). Entries outside the band are an error. */
export function bandAdd(m: BandMatrix, i: number, j: number, v: number): void {
  const r = i >= j ? i : j;
  const k = i >= j ? i - j : j - i;
  if (k > m.hb) throw new RangeError(`entry (${i}, ${j}) outside half-bandwidth ${m.hb}`);
  m.a[r * (m.hb + 1) + k] += v;
}

/**
 * Factorises in place into L D Lᵀ (unit lower L kept in the band, D on the diagonal).
 * Returns false when a pivot is not positive, which for a stiffness matrix means the structure
 * is a mechanism (for example a beam line with a free node and no support).
 */
export function factorBand(m: BandMatrix): boolean {
  const { n, hb, a } = m;
  const w = hb + 1;
  let maxDiag = 0;
  for (let i = 0; i < n; i++) maxDiag = Math.max(maxDiag, Math.abs(a[i * w]));
  const tiny = maxDiag * 1e-12;
  for (let i = 0; i < n; i++) {
    const j0 = i - hb > 0 ? i - hb : 0;
    for (let j = j0; j <= i; j++) {
      let s = a[i * w + (i - j)];
      // L(i,k) and L(j,k) are both inside the band only for k >= i - hb (i >= j)
      for (let k = j0; k < j; k++) {
        s -= a[i * w + (i - k)] * a[k * w] * a[j * w + (j - k)];
      }
      if (j < i) a[i * w + (i - j)] = s / a[j * w];
      else {
        if (!(s > tiny)) return false;
        a[i * w] = s;
      }
    }
  }
  return true;
}

/** Solves (L D Lᵀ) x = b in place on b, with m already factorised by factorBand. */
export function solveBand(m: BandMatrix, b: Float64Array): void {
  const { n, hb, a } = m;
  const w = hb + 1;
  for (let i = 0; i < n; i++) {
    let s = b[i];
    const k0 = i - hb > 0 ? i - hb : 0;
    for (let k = k0; k < i; k++) s -= a[i * w + (i - k)] * b[k];
    b[i] = s;
  }
  for (let i = 0; i < n; i++) b[i] /= a[i * w];
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    const k1 = i + hb < n - 1 ? i + hb : n - 1;
    for (let k = i + 1; k <= k1; k++) s -= a[k * w + (k - i)] * b[k];
    b[i] = s;
  }
}

/**
 * Plain dense Gaussian elimination with partial pivoting, for comparison in the benchmark and
 * as an independent check in tests. a is n×n row-major and is overwritten; b is overwritten by x.
 */
export function solveDense(n: number, a: Float64Array, b: Float64Array): void {
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]) > Math.abs(a[p * n + c])) p = r;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const t = a[c * n + k];
        a[c * n + k] = a[p * n + k];
        a[p * n + k] = t;
      }
      const t = b[c];
      b[c] = b[p];
      b[p] = t;
    }
    const piv = a[c * n + c];
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c] / piv;
      if (f === 0) continue;
      for (let k = c; k < n; k++) a[r * n + k] -= f * a[c * n + k];
      b[r] -= f * b[c];
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r];
    for (let k = r + 1; k < n; k++) s -= a[r * n + k] * b[k];
    b[r] = s / a[r * n + r];
  }
}
