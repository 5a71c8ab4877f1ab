import { MEDIAN_WINDOW_MIN, MEDIAN_WINDOW_SAMPLE, medianFromWindow, medianInPlace, medianWindow } from '../trace/robustStats';
import { fitVariogramLine } from './variogramLine';

/**
 * How much correlated noise inflates the variance of a least-squares estimate over white noise
 * of the same σ: the integrated autocorrelation time τ = 1 + 2·Σ_{k≥1} (1 − k/n)·ρ_k of the
 * residuals, the sum taken up to the first lag with ρ_k ≤ 0, so that n/τ is the effective number
 * of independent samples (G. V. Bayley, J. M. Hammersley, "The 'effective' number of independent
 * observations in an autocorrelated time series", Suppl. J. R. Stat. Soc. 8, 184–197 (1946); the
 * truncation at the first zero crossing as in H. von Storch, F. W. Zwiers, "Statistical Analysis
 * in Climate Research", CUP (1999), §17.1; both from memory). For AR(1) noise with lag-one
 * correlation ρ this gives τ → (1 + ρ)/(1 − ρ).
 *
 * Valid when the model's Jacobian varies slowly over the correlation time (fringes much slower
 * than the noise's memory), the usual case with 10⁴ samples a layer. Returns 1 for fewer than
 * 8 residuals.
 */
export function autocorrelationTime(e: ArrayLike<number>, from = 0, to = e.length): number {
  const n = to - from;
  if (n < 8) return 1;
  let mean = 0;
  for (let i = from; i < to; i++) mean += e[i];
  mean /= n;
  let c0 = 0;
  for (let i = from; i < to; i++) c0 += (e[i] - mean) ** 2;
  if (!(c0 > 0)) return 1;
  let tau = 1;
  const maxLag = Math.floor(n / 4);
  for (let k = 1; k <= maxLag; k++) {
    let c = 0;
    for (let i = from; i + k < to; i++) c += (e[i] - mean) * (e[i + k] - mean);
    const rho = c / c0;
    if (rho <= 0) break;
    tau += 2 * (1 - k / n) * rho;
  }
  return tau;
}

/** The effective number of independent samples, n/τ (see autocorrelationTime). */
export function effectiveSampleCount(e: ArrayLike<number>): number {
  return e.length / autocorrelationTime(e);
}

/** Variogram sums per lag, pooled over several series of one noise (see fitAr1PlusWhite). */
export interface VariogramPool {
  sums: Map<number, number>;
  counts: Map<number, number>;
}

export const newVariogramPool = (): VariogramPool => ({ sums: new Map(), counts: new Map() });

/** White plus AR(1) noise: e_i = w_i + x_i, x_i = ρ·x_{i−1} + u_i; σ² of each part. */
export interface Ar1PlusWhite {
  whiteVar: number;
  ar1Var: number;
  /** Lag-one correlation of the AR(1) part. */
  rho: number;
  /**
   * Long-run σ of one sample: √(2π·spectral density at zero) = √(σ_w² + σ_x²·(1 + ρ)/(1 − ρ)), so
   * that the mean of m samples has σ ≈ longRunSigma/√m when m spans many correlation times.
   */
  longRunSigma: number;
}

/**
 * White plus AR(1) noise fitted to a series' robust variogram γ(k) = ½·Var(e_{i+k} − e_i) at lags
 * 1…maxLag: γ(k) = σ_w² + σ_x²·(1 − ρ^k) (the AR(1) autocorrelation ρ^k, G. E. P. Box,
 * G. M. Jenkins, "Time Series Analysis", Holden-Day (1970), §3.2; the sum's variogram by
 * independence), least squares in (σ_w², σ_x²) for each ρ on a grid up to ρ^maxLag = 0.3. Differences at lags of a
 * few correlation times hardly see a slow trend in the series (a model's slow misfit), unlike
 * the series' variance; winsorising the differences keeps spikes out. The lag-one-only reading
 * (trace/levelSteps longRunSigma) takes white + AR(1) for a faster AR(1) and underestimates.
 */
export function fitAr1PlusWhite(e: ArrayLike<number>, maxLag = 40, pool?: VariogramPool): Ar1PlusWhite {
  const { lags, gamma } = variogram(e, maxLag, pool);
  return fitVariogram(lags, gamma);
}

/**
 * fitAr1PlusWhite of the pool after the last of several series was added to it (addToVariogramPool):
 * each added series' fit but the last is not needed when only the last is kept.
 */
export function fitPooledVariogram(lags: readonly number[], pool: VariogramPool): Ar1PlusWhite {
  return fitVariogram(lags, lags.map((k) => pool.sums.get(k)! / pool.counts.get(k)!));
}

/** A series' variogram sums into the pool (as fitAr1PlusWhite adds them); returns its lags, for fitPooledVariogram. */
export function addToVariogramPool(e: ArrayLike<number>, maxLag: number, pool: VariogramPool): number[] {
  return variogram(e, maxLag, pool).lags;
}

/** The robust variogram γ(k) at fitAr1PlusWhite's lags (the pool's, after adding this series, with a pool). */
function variogram(e: ArrayLike<number>, maxLag: number, pool?: VariogramPool): { lags: number[]; gamma: number[] } {
  const n = e.length;
  const L = Math.min(maxLag, Math.floor(n / 4));
  // Every lag up to 8, then every 2nd: the short lags carry the white part and ρ, the rest the level.
  const lags: number[] = [];
  for (let k = 1; k <= L; k += k < 8 ? 1 : 2) lags.push(k);
  let gamma: number[] = [];
  // Arrays shared by every lag: the differences, the values near a median (in a window: see
  // trace/robustStats.ts medianFromWindow), and a copy to reorder when the median is not there.
  const d = new Float64Array(n), near = new Float64Array(n + 1), work = new Float64Array(n);
  const sample = new Float64Array(MEDIAN_WINDOW_SAMPLE), tally = new Int32Array(2);
  const sums: number[] = [], counts: number[] = [];
  let last: { k: number; med: number; mad: number } | null = null;
  for (const k of lags) {
    const m = n - k;
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
      differencesInWindow(e, k, d, centre - half, centre + half, near, tally);
      med = medianFromWindow(near, tally[1], tally[0], m);
    } else differencesAt(e, k, d);
    if (windowed && med === null) med = medianInSampledWindow(d, m, null, sample, near, tally);
    if (med === null) {
      work.set(d.subarray(0, m));
      med = medianInPlace(work.subarray(0, m));
    }
    let mad: number | null = null;
    if (windowed && last && last.mad > 0) {
      deviationsInWindow(d, m, med, MAD_HINT_LOW * last.mad, MAD_HINT_HIGH * last.mad, near, tally);
      mad = medianFromWindow(near, tally[1], tally[0], m);
    }
    if (windowed && mad === null) mad = medianInSampledWindow(d, m, med, sample, near, tally);
    if (mad === null) {
      absoluteDeviations(d, med, m, work);
      mad = medianInPlace(work.subarray(0, m));
    }
    last = { k, med, mad };
    const ss = cappedSquares(d, m, med, 4 * 1.4826 * mad);
    gamma.push(ss / m / 2);
    sums.push(ss / 2);
    counts.push(m);
  }
  if (pool) {
    // The noise is the detector's: pooled over the series read so far (same lags), it scatters less.
    lags.forEach((k, q) => {
      pool.sums.set(k, (pool.sums.get(k) ?? 0) + sums[q]);
      pool.counts.set(k, (pool.counts.get(k) ?? 0) + counts[q]);
    });
    gamma = lags.map((k) => pool.sums.get(k)! / pool.counts.get(k)!);
  }
  return { lags, gamma };
}

/** Half-width of the window about the last lag's median of the differences, in its MAD (±0.1 σ for Gaussian differences: ~8 % of them, where the median moves by ~0.02 σ between lags of 6000 values). */
const MED_HINT = 0.15;
/** The window about the last lag's MAD, as fractions of it: the MAD grows with the lag (by a few % a lag past the first few). */
const MAD_HINT_LOW = 0.98, MAD_HINT_HIGH = 1.1;

/**
 * The median of d[i] for i < m (with a centre: of |d[i] − centre|) within the window a strided
 * sample of those values places (robustStats medianWindow), or null when it is not there.
 */
function medianInSampledWindow(d: Float64Array, m: number, centre: number | null, sample: Float64Array, near: Float64Array, tally: Int32Array): number | null {
  for (let q = 0; q < MEDIAN_WINDOW_SAMPLE; q++) {
    const x = d[Math.floor((q * m) / MEDIAN_WINDOW_SAMPLE)];
    sample[q] = centre === null ? x : Math.abs(x - centre);
  }
  const w = medianWindow(sample);
  if (centre === null) valuesInWindow(d, m, w.lo, w.hi, near, tally);
  else deviationsInWindow(d, m, centre, w.lo, w.hi, near, tally);
  return medianFromWindow(near, tally[1], tally[0], m);
}

// The loops over the samples sit in small functions of their own (see trace/robustStats.ts), and
// the arrays are allocated once a series, not once a lag.

/** d[i] ← e[i + k] − e[i] for i < n − k. */
function differencesAt(e: ArrayLike<number>, k: number, d: Float64Array): void {
  const m = e.length - k;
  for (let i = 0; i < m; i++) d[i] = e[i + k] - e[i];
}

/**
 * differencesAt, and those within [lo, hi] copied to the front of `near`, without branching on
 * the data; tally ← [count below lo, count within].
 */
function differencesInWindow(e: ArrayLike<number>, k: number, d: Float64Array, lo: number, hi: number, near: Float64Array, tally: Int32Array): void {
  const m = e.length - k;
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = e[i + k] - e[i];
    d[i] = x;
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  tally[0] = b;
  tally[1] = c;
}

/** Of d[i] for i < m, those within [lo, hi] copied to the front of `near`; tally as differencesInWindow. */
function valuesInWindow(d: Float64Array, m: number, lo: number, hi: number, near: Float64Array, tally: Int32Array): void {
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = d[i];
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  tally[0] = b;
  tally[1] = c;
}

/** out[i] ← |d[i] − med| for i < m. */
function absoluteDeviations(d: Float64Array, med: number, m: number, out: Float64Array): void {
  for (let i = 0; i < m; i++) out[i] = Math.abs(d[i] - med);
}

/** Of |d[i] − med| for i < m, those within [lo, hi] copied to the front of `near`; tally as differencesInWindow. */
function deviationsInWindow(d: Float64Array, m: number, med: number, lo: number, hi: number, near: Float64Array, tally: Int32Array): void {
  let c = 0, b = 0;
  for (let i = 0; i < m; i++) {
    const x = Math.abs(d[i] - med);
    near[c] = x;
    c += ((x >= lo) as unknown as number) & ((x <= hi) as unknown as number);
    b += (x < lo) as unknown as number;
  }
  tally[0] = b;
  tally[1] = c;
}

/** Σ min(|d[i] − med|, cap)² over i < m, in order. */
function cappedSquares(d: Float64Array, m: number, med: number, cap: number): number {
  let ss = 0;
  for (let i = 0; i < m; i++) ss += Math.min(Math.abs(d[i] - med), cap) ** 2;
  return ss;
}

/** The white + AR(1) least squares of fitAr1PlusWhite on a variogram γ at its lags. */
function fitVariogram(lags: readonly number[], gamma: readonly number[]): Ar1PlusWhite {
  if (lags.length < 2) {
    const v = gamma[0] ?? 0;
    return { whiteVar: v, ar1Var: 0, rho: 0, longRunSigma: Math.sqrt(v) };
  }
  let best = { ssr: Infinity, whiteVar: gamma[0], ar1Var: 0, rho: 0 };
  // ρ no larger than the lags can resolve (ρ^L ≤ 0.3 at the longest lag): a slower part is not
  // told from a trend and would have its long-run variance extrapolated from a short rise.
  const rhoMax = Math.min(0.995, 0.3 ** (1 / lags[lags.length - 1]));
  const unit = lags.map(() => 1);
  for (let g = 0; g <= 200; g++) {
    const rho = (g / 200) * rhoMax;
    const { ssr, A, B } = fitVariogramLine(lags, gamma, unit, rho);
    if (ssr < best.ssr) best = { ssr, whiteVar: Math.max(0, A - B), ar1Var: B, rho };
  }
  const { whiteVar, ar1Var, rho } = best;
  return { whiteVar, ar1Var, rho, longRunSigma: Math.sqrt(whiteVar + (ar1Var * (1 + rho)) / (1 - rho)) };
}

/**
 * Whitens series under white plus AR(1) noise: the Kalman filter's standardised innovations
 * (y_i − ρ·x̂_{i−1})/√F_i of y = x + w, x AR(1) (the exact Σ^(−1/2) of generalised least squares
 * by the innovations form; e.g. A. C. Harvey, "Forecasting, Structural Time Series Models and
 * the Kalman Filter", CUP (1989), §3.4, from memory). Without white noise this is the
 * Prais–Winsten transformation: (1 − ρ²)^½·y_0, then y_i − ρ·y_{i−1}, over σ_u (S. J. Prais,
 * C. B. Winsten, Cowles Commission Discussion Paper 383 (1954)). The same linear filter is
 * applied to every series given (residuals and Jacobian columns alike), in place.
 */
export function whitenAr1PlusWhite(noise: Pick<Ar1PlusWhite, 'whiteVar' | 'ar1Var' | 'rho'>, series: Float64Array[], from = 0, to = series[0]?.length ?? 0): void {
  const { whiteVar: R, ar1Var, rho } = noise;
  const q = ar1Var * (1 - rho * rho);
  // The gains do not depend on the data: once, then each series alone.
  const gain = new Float64Array(to - from), scale = new Float64Array(to - from);
  let P = ar1Var; // prior variance of x_0: the stationary one
  for (let i = 0; i < to - from; i++) {
    const Pm = i === 0 ? P : rho * rho * P + q;
    const F = Pm + R;
    gain[i] = F > 0 ? Pm / F : 0;
    scale[i] = F > 0 ? 1 / Math.sqrt(F) : 0;
    P = (1 - gain[i]) * Pm;
  }
  for (const y of series) {
    let xhat = 0;
    for (let i = from; i < to; i++) {
      const pred = i === from ? 0 : rho * xhat;
      const innov = y[i] - pred;
      xhat = pred + gain[i - from] * innov;
      y[i] = innov * scale[i - from];
    }
  }
}
