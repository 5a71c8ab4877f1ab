/** Median of values (copied; the input is not reordered). NaN for an empty input. */
export function median(values: ArrayLike<number>): number {
  return values.length === 0 ? NaN : medianInPlace(Float64Array.from(values));
}

/** Median of a scratch array, which it reorders (no copy: for long temporary series). NaN for an empty input. */
export function medianInPlace(a: Float64Array): number {
  const n = a.length;
  if (n === 0) return NaN;
  const mid = n >> 1;
  const upper = quickselect(a, mid);
  return n % 2 === 1 ? upper : 0.5 * (largest(a, mid) + upper);
}

// The loops of these functions sit in small functions of their own, so the engine optimises
// each with the feedback of its own loop (a long function with several loops, called a few
// times, was optimised mid-loop and thrown back at the next loop over and over).

/** Largest of a[0, end). */
function largest(a: Float64Array, end: number): number {
  let v = -Infinity;
  for (let i = 0; i < end; i++) if (a[i] > v) v = a[i];
  return v;
}

/** k-th smallest element (0-based), partially reordering a in place (Hoare's selection). */
function quickselect(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    const pivot = medianOf3(a[lo], a[(lo + hi) >> 1], a[hi]);
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

function medianOf3(x: number, y: number, z: number): number {
  return x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
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
