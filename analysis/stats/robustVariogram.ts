import { MEDIAN_WINDOW_MIN, MEDIAN_WINDOW_SAMPLE, medianFromWindow, medianInPlace, medianWindow } from '../trace/robustStats';
import { type VariogramPool } from './correlatedNoise';

/** A series' robust variogram at fitAr1PlusWhite's lags: γ(k), and the sums and counts a pool adds. */
export interface VariogramSums {
  lags: number[];
  gamma: number[];
  sums: number[];
  counts: number[];
}

/** The robust variogram γ(k) at fitAr1PlusWhite's lags (the pool's, after adding this series, with a pool). */
export function robustVariogram(e: ArrayLike<number>, maxLag: number, pool?: VariogramPool): { lags: number[]; gamma: number[] } {
  const v = variogramSums(e, maxLag);
  return { lags: v.lags, gamma: pooledGamma(v, pool) };
}

/**
 * γ(k) of a series' variogram, or with a pool, the pool's after adding it (its sums to the pool's
 * in the order the series come): the part of fitAr1PlusWhite that reads the pool.
 */
export function pooledGamma(v: VariogramSums, pool?: VariogramPool): number[] {
  if (!pool) return v.gamma;
  // The noise is the detector's: pooled over the series read so far (same lags), it scatters less.
  v.lags.forEach((k, q) => {
    pool.sums.set(k, (pool.sums.get(k) ?? 0) + v.sums[q]);
    pool.counts.set(k, (pool.counts.get(k) ?? 0) + v.counts[q]);
  });
  return v.lags.map((k) => pool.sums.get(k)! / pool.counts.get(k)!);
}

/** The robust variogram of a series alone (see robustVariogram), with its sums for a pool. */
export function variogramSums(e: ArrayLike<number>, maxLag: number): VariogramSums {
  const n = e.length;
  const L = Math.min(maxLag, Math.floor(n / 4));
  // Every lag up to 8, then every 2nd: the short lags carry the white part and ρ, the rest the level.
  const lags: number[] = [];
  for (let k = 1; k <= L; k += k < 8 ? 1 : 2) lags.push(k);
  const gamma: number[] = [];
  // Arrays shared by every lag: the differences, the values near a median (in a window: see
  // trace/robustStats.ts medianFromWindow), and a copy to reorder when the median is not there.
  const d = new Float64Array(n), near = new Float64Array(n + 1), work = new Float64Array(n);
  const sample = new Float64Array(MEDIAN_WINDOW_SAMPLE);
  const sums: number[] = [], counts: number[] = [];
  let last: { k: number; med: number; mad: number } | null = null;
  // the count within the window of this lag's differences when the last lag's sum already took them (else −1)
  let ahead = -1;
  for (let q = 0; q < lags.length; q++) {
    const k = lags[q], m = n - k;
    // Squared differences, winsorised at 4 MAD-σ: nearly the efficiency of the plain mean (the
    // MAD alone has 37 %), without the spikes. Each median from one pass over the values, which
    // gathers those in a window: first around the last lag's (the median of the differences
    // scaled with the lag, as a slow trend's would be; the MAD a little above the last),
    // then, if it is not there, around a strided sample's; then by selection on all. Any way
    // the same medians (and the sum reads the deviations again, in order).
    const windowed = m >= MEDIAN_WINDOW_MIN;
    let med: number | null = null;
    if (windowed && last && last.mad > 0) {
      const centre = (last.med * k) / last.k, half = MED_HINT * last.mad;
      const inside = ahead >= 0 ? ahead : differencesInWindow(e, k, d, centre - half, centre + half, near);
      med = medianFromWindow(near, inside, windowBelow, m);
    } else differencesAt(e, k, d);
    ahead = -1;
    if (windowed && med === null) med = medianInSampledWindow(d, m, null, sample, near);
    if (med === null) {
      work.set(d.subarray(0, m));
      med = medianInPlace(work.subarray(0, m));
    }
    let mad: number | null = null;
    if (windowed && last && last.mad > 0) {
      const inside = deviationsInWindow(d, m, med, MAD_HINT_LOW * last.mad, MAD_HINT_HIGH * last.mad, near);
      mad = medianFromWindow(near, inside, windowBelow, m);
    }
    if (windowed && mad === null) mad = medianInSampledWindow(d, m, med, sample, near);
    if (mad === null) {
      absoluteDeviations(d, med, m, work);
      mad = medianInPlace(work.subarray(0, m));
    }
    last = { k, med, mad };
    // The next lag's differences (and its window, the same as it would place) in the pass that
    // sums this lag's squares: one pass over the series fewer, each sum in the same order.
    const next = q + 1 < lags.length ? lags[q + 1] : 0;
    let ss: number;
    if (next > 0 && n - next >= MEDIAN_WINDOW_MIN && mad > 0) {
      const centre = (med * next) / k, half = MED_HINT * mad;
      ahead = squaresAndNextDifferences(e, d, m, med, 4 * 1.4826 * mad, next, centre - half, centre + half, near);
      ss = squaresSum;
    } else ss = cappedSquares(d, m, med, 4 * 1.4826 * mad);
    gamma.push(ss / m / 2);
    sums.push(ss / 2);
    counts.push(m);
  }
  return { lags, gamma, sums, counts };
}

/** Half-width of the window about the last lag's median of the differences, in its MAD (±0.1 σ for Gaussian differences: ~8 % of them, where the median moves by ~0.02 σ between lags of 6000 values). */
const MED_HINT = 0.15;
/** The window about the last lag's MAD, as fractions of it: the MAD grows with the lag (by a few % a lag past the first few). */
const MAD_HINT_LOW = 0.98, MAD_HINT_HIGH = 1.1;

/**
 * The median of d[i] for i < m (with a centre: of |d[i] − centre|) within the window a strided
 * sample of those values places (robustStats medianWindow), or null when it is not there.
 */
function medianInSampledWindow(d: Float64Array, m: number, centre: number | null, sample: Float64Array, near: Float64Array): number | null {
  for (let q = 0; q < MEDIAN_WINDOW_SAMPLE; q++) {
    const x = d[Math.floor((q * m) / MEDIAN_WINDOW_SAMPLE)];
    sample[q] = centre === null ? x : Math.abs(x - centre);
  }
  const w = medianWindow(sample);
  const inside = centre === null ? valuesInWindow(d, m, w.lo, w.hi, near) : deviationsInWindow(d, m, centre, w.lo, w.hi, near);
  return medianFromWindow(near, inside, windowBelow, m);
}

// The loops over the samples sit in small functions of their own (see trace/robustStats.ts), and
// the arrays are allocated once a series, not once a lag. The window loops return one count and
// leave the other in a module variable: a store into an array after the loop had no type feedback
// when the engine compiled the loop on the stack during the first call, so that code left at the
// store on every later call (about 50 times a thread a run) and ran the loop unoptimised.

/** The count below the window of the last window loop (differencesInWindow and the like). */
let windowBelow = 0;

/** d[i] ← e[i + k] − e[i] for i < n − k. */
function differencesAt(e: ArrayLike<number>, k: number, d: Float64Array): void {
  const m = e.length - k;
  for (let i = 0; i < m; i++) d[i] = e[i + k] - e[i];
}

/**
 * differencesAt, and those within [lo, hi] copied to the front of `near`, without branching on
 * the data; returns the count within, the count below lo goes to windowBelow.
 */
function differencesInWindow(e: ArrayLike<number>, k: number, d: Float64Array, lo: number, hi: number, near: Float64Array): number {
  const m = e.length - k;
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = e[i + k] - e[i];
    d[i] = x;
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  windowBelow = b;
  return c;
}

/** Of d[i] for i < m, those within [lo, hi] copied to the front of `near`; counts as differencesInWindow. */
function valuesInWindow(d: Float64Array, m: number, lo: number, hi: number, near: Float64Array): number {
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = d[i];
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  windowBelow = b;
  return c;
}

/** out[i] ← |d[i] − med| for i < m. */
function absoluteDeviations(d: Float64Array, med: number, m: number, out: Float64Array): void {
  for (let i = 0; i < m; i++) out[i] = Math.abs(d[i] - med);
}

/** Of |d[i] − med| for i < m, those within [lo, hi] copied to the front of `near`; counts as differencesInWindow. */
function deviationsInWindow(d: Float64Array, m: number, med: number, lo: number, hi: number, near: Float64Array): number {
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = Math.abs(d[i] - med);
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  windowBelow = b;
  return c;
}

/** Σ min(|d[i] − med|, cap)² over i < m, in order. */
function cappedSquares(d: Float64Array, m: number, med: number, cap: number): number {
  let ss = 0;
  for (let i = 0; i < m; i++) ss += Math.min(Math.abs(d[i] - med), cap) ** 2;
  return ss;
}

/**
 * cappedSquares(d, m, med, cap) (its sum to squaresSum) and, in the same pass, differencesInWindow
 * for lag k2 (> the lag of d): d[i] is read for the sum before the next lag's difference
 * overwrites it. One loop with the second part under a test (code after a loop, compiled on the
 * stack, left at it on every call: see windowBelow).
 */
function squaresAndNextDifferences(
  e: ArrayLike<number>, d: Float64Array, m: number, med: number, cap: number, k2: number, lo: number, hi: number, near: Float64Array,
): number {
  const m2 = e.length - k2;
  let ss = 0, c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    ss += Math.min(Math.abs(d[i] - med), cap) ** 2;
    if (i < m2) {
      const x = e[i + k2] - e[i];
      d[i] = x;
      near[c] = x;
      c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
      b += (x < lo) as unknown as number;
    }
  }
  squaresSum = ss;
  windowBelow = b;
  return c;
}

/** squaresAndNextDifferences's sum. */
let squaresSum = 0;
