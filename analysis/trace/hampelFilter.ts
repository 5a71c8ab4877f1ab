import { medianInPlace } from './robustStats';

/**
 * A copy of the series with its spikes replaced by the local median: the Hampel identifier, a
 * sample further than `threshold`·1.4826·MAD from the median of the 2h + 1 samples around it
 * (R. K. Pearson, "Outliers in process modeling and identification", IEEE Trans. Control Syst.
 * Technol. 10, 55–63 (2002); the identifier after F. R. Hampel, J. Am. Stat. Assoc. 69, 383–393
 * (1974); from memory). The local window follows a slow noise's level, so a one- or two-sample
 * spike stands out against the white part alone.
 */
export function hampelFilter(y: ArrayLike<number>, h = 7, threshold = 6): Float64Array {
  const n = y.length;
  const out = Float64Array.from(y);
  const w = 2 * h + 1;
  if (n < w) return out;
  for (let i = 0; i < n; i++) if (!Number.isFinite(y[i])) return hampelBySelection(y, out, h, threshold);
  // The window kept sorted as it slides (one value out, one in), so its median is its middle and
  // its MAD the h-th smallest distance from it, merged from the two sorted sides: the same order
  // statistics as a selection on each window (the identifier ran 2n selections of 2h + 1).
  const sorted = new Float64Array(w);
  for (let j = 0; j < w; j++) sorted[j] = y[j];
  sorted.sort();
  let a = 0;
  for (let i = 0; i < n; i++) {
    const ai = Math.max(0, Math.min(i - h, n - w));
    if (ai !== a) {
      slide(sorted, y[a], y[ai + w - 1]);
      a = ai;
    }
    const med = sorted[h];
    const mad = 1.4826 * distanceRank(sorted, h);
    if (Math.abs(y[i] - med) > threshold * mad && mad > 0) out[i] = med;
  }
  return out;
}

/** The sorted window with `gone` replaced by `come`, kept sorted. */
function slide(s: Float64Array, gone: number, come: number): void {
  let p = 0;
  while (s[p] !== gone) p++;
  while (p > 0 && s[p - 1] > come) {
    s[p] = s[p - 1];
    p--;
  }
  while (p < s.length - 1 && s[p + 1] < come) {
    s[p] = s[p + 1];
    p++;
  }
  s[p] = come;
}

/**
 * The median of |s[k] − s[h]| over the sorted window s of 2h + 1 (rank h of the distances: the
 * middle's own 0, then the h − 1 smallest of the two sides, each side's distances increasing
 * away from the middle; s[h] − s[k] is exactly −(s[k] − s[h]) in rounding to nearest).
 */
function distanceRank(s: Float64Array, h: number): number {
  const med = s[h];
  let l = h - 1, r = h + 1, d = 0;
  for (let taken = 0; taken < h; taken++) {
    const dl = l >= 0 ? med - s[l] : Infinity;
    const dr = r < s.length ? s[r] - med : Infinity;
    if (dl <= dr) {
      d = dl;
      l--;
    } else {
      d = dr;
      r++;
    }
  }
  return d;
}

/** The identifier by a selection on each window (a series with a value that is not finite, whose order a sort and a selection may differ on). */
function hampelBySelection(y: ArrayLike<number>, out: Float64Array, h: number, threshold: number): Float64Array {
  const n = y.length;
  const win = new Float64Array(2 * h + 1);
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, Math.min(i - h, n - 2 * h - 1));
    for (let j = 0; j < win.length; j++) win[j] = y[a + j];
    const med = medianInPlace(win);
    for (let j = 0; j < win.length; j++) win[j] = Math.abs(y[a + j] - med);
    const mad = 1.4826 * medianInPlace(win);
    if (Math.abs(y[i] - med) > threshold * mad && mad > 0) out[i] = med;
  }
  return out;
}
