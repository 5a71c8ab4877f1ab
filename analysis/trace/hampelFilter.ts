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
  if (n < 2 * h + 1) return out;
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
