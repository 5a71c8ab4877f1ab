import { largest } from './extremes';

/** Median of values (copied; the input is not reordered). NaN for an empty input. */
export function median(values: ArrayLike<number>): number {
  return values.length === 0 ? NaN : medianInPlace(Float64Array.from(values));
}

/** Median of a scratch array, which it reorders (no copy: for long temporary series). NaN for an empty input. */
export function medianInPlace(a: Float64Array): number {
  const n = a.length;
  if (n === 0) return NaN;
  const mid = n >> 1;
  if (n >= MEDIAN_WINDOW_MIN) {
    const v = medianInWindow(a);
    if (v !== null) return v;
  }
  const upper = quickselect(a, mid);
  return n % 2 === 1 ? upper : 0.5 * (largest(a, mid) + upper);
}

// The loops of these functions sit in small functions of their own, so the engine optimises
// each with the feedback of its own loop (a long function with several loops, called a few
// times, was optimised mid-loop and thrown back at the next loop over and over).

/** Long arrays first look for the median between two values a sample of them places around it. */
export const MEDIAN_WINDOW_MIN = 2048;
/** Size of the strided sample that places the window (medianWindow). */
export const MEDIAN_WINDOW_SAMPLE = 256;
/** Ranks either side of the sample's median: 2.5 binomial σ (√(256/4) = 8), so the window holds the median in ~99 % of draws. */
const SAMPLE_SPREAD = 20;

/**
 * The median of a when it lies between two order statistics [lo, hi] of a strided sample of a:
 * one pass counts the values below lo and copies those within to a scratch array, without
 * branching on the data, and the selection runs on those alone (the idea of Floyd and Rivest's
 * SELECT, see quickselect). null (a untouched) when the median is not there.
 */
function medianInWindow(a: Float64Array): number | null {
  const n = a.length;
  const sample = new Float64Array(MEDIAN_WINDOW_SAMPLE);
  const stride = n / MEDIAN_WINDOW_SAMPLE;
  for (let q = 0; q < MEDIAN_WINDOW_SAMPLE; q++) sample[q] = a[Math.floor(q * stride)];
  const { lo, hi } = medianWindow(sample);
  if (windowScratch.length < n + 1 && n < KEPT_SCRATCH) windowScratch = new Float64Array(Math.min(2 * n, KEPT_SCRATCH));
  const out = windowScratch.length > n ? windowScratch : new Float64Array(n + 1);
  const below = gatherWindow(a, lo, hi, out);
  return medianFromWindow(out, gathered, below, n);
}

/** The bounds of a window that holds the median of an array in ~99 % of draws, from a strided sample of it (MEDIAN_WINDOW_SAMPLE values; reordered). */
export function medianWindow(sample: Float64Array): { lo: number; hi: number } {
  return { lo: quickselect(sample, MEDIAN_WINDOW_SAMPLE / 2 - SAMPLE_SPREAD), hi: quickselect(sample, MEDIAN_WINDOW_SAMPLE / 2 + SAMPLE_SPREAD) };
}

/**
 * The median of n values of which `below` lie below a window [lo, hi] and window[0, inside)
 * within it (reordered here), or null when the median is not within. The values below lo, those
 * within and those above hi keep that order, so the k-th of all is the (k − below)-th of the
 * window, ties included.
 */
export function medianFromWindow(window: Float64Array, inside: number, below: number, n: number): number | null {
  const mid = n >> 1, even = n % 2 === 0;
  if (below > (even ? mid - 1 : mid) || mid >= below + inside) return null;
  const w = window.subarray(0, inside);
  const upper = quickselect(w, mid - below);
  return even ? 0.5 * (largest(w, mid - below) + upper) : upper;
}

// gatherWindow's scratch, kept between calls up to KEPT_SCRATCH values (a longer array has one of
// its own for the call), and its second result.
const KEPT_SCRATCH = 1 << 16;
let windowScratch = new Float64Array(0);
let gathered = 0;

/** Copies the values of a within [lo, hi] to the front of out (their count to `gathered`); returns the count below lo. */
function gatherWindow(a: Float64Array, lo: number, hi: number, out: Float64Array): number {
  let c = 0, b = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    out[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  gathered = c;
  return b;
}

/**
 * k-th smallest element (0-based), partially reordering a in place so that a[0, k) ≤ a[k] ≤
 * a(k, n): Floyd and Rivest's selection (R. W. Floyd, R. L. Rivest, "Algorithm 489: The
 * algorithm SELECT", Commun. ACM 18, 173 (1975)), which first narrows the range to a small sample's
 * estimate of the k-th value and so needs about n + min(k, n − k) comparisons, against about 3.4·n
 * for Hoare's selection with a median-of-3 pivot.
 */
function quickselect(a: Float64Array, k: number): number {
  select(a, 0, a.length - 1, k);
  return a[k];
}

function select(a: Float64Array, left: number, right: number, k: number): void {
  while (right > left) {
    if (right - left > 600) {
      // recurse on a sample of size s around the expected position of the k-th value
      const n = right - left + 1;
      const i = k - left + 1;
      const z = Math.log(n);
      const s = 0.5 * Math.exp((2 * z) / 3);
      const sd = 0.5 * Math.sqrt((z * s * (n - s)) / n) * (i - n / 2 < 0 ? -1 : 1);
      select(a, Math.max(left, Math.floor(k - (i * s) / n + sd)), Math.min(right, Math.floor(k + ((n - i) * s) / n + sd)), k);
    }
    const t = a[k];
    let i = left;
    let j = right;
    swap(a, left, k);
    if (a[right] > t) swap(a, left, right);
    while (i < j) {
      swap(a, i, j);
      i++;
      j--;
      while (a[i] < t) i++;
      while (a[j] > t) j--;
    }
    if (a[left] === t) swap(a, left, j);
    else {
      j++;
      swap(a, j, right);
    }
    if (j <= k) left = j + 1;
    if (k <= j) right = j - 1;
  }
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}
/**
 * Robust white-noise σ of a sampled signal from its second differences, which cancel any
 * locally linear trend: Var(y[i+1] − 2y[i] + y[i−1]) = 6σ², and σ ≈ 1.4826 · MAD for Gaussian
 * noise (common practice). Returns 0 for fewer than 3 samples.
 */
export function noiseSigma(y: ArrayLike<number>): number {
  const n = y.length;
  if (n < 3) return 0;
  const d = secondDifferences(y);
  absoluteDeviations(d, medianInPlace(d));
  return (1.4826 * medianInPlace(d)) / Math.sqrt(6);
}

function secondDifferences(y: ArrayLike<number>): Float64Array {
  const n = y.length;
  const d = new Float64Array(n - 2);
  for (let i = 1; i < n - 1; i++) d[i - 1] = y[i + 1] - 2 * y[i] + y[i - 1];
  return d;
}

/** d[i] ← |d[i] − m|, in place. */
function absoluteDeviations(d: Float64Array, m: number): void {
  for (let i = 0; i < d.length; i++) d[i] = Math.abs(d[i] - m);
}
