import { pooledGamma, robustVariogram, variogramSums, type VariogramSums } from './robustVariogram';
import { fitVariogramLineInto, powersAtLags } from './variogramLine';

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
  return fitAr1PlusWhiteSums(variogramSums(e, maxLag), pool);
}

/** fitAr1PlusWhite of a series' variogram computed before (variogramSums, e.g. on another thread), pooled here. */
export function fitAr1PlusWhiteSums(v: VariogramSums, pool?: VariogramPool): Ar1PlusWhite {
  return fitVariogram(v.lags, pooledGamma(v, pool));
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
  return robustVariogram(e, maxLag, pool).lags;
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
  const unit = new Float64Array(lags.length).fill(1);
  const powers = gridPowers(lags, rhoMax);
  const fit = new Float64Array(3);
  const gammaAt = Float64Array.from(gamma);
  for (let g = 0; g <= 200; g++) {
    const rho = (g / 200) * rhoMax;
    fitVariogramLineInto(gammaAt, unit, rho, powers[g], fit);
    const ssr = fit[0], A = fit[1], B = fit[2];
    if (ssr < best.ssr) best = { ssr, whiteVar: Math.max(0, A - B), ar1Var: B, rho };
  }
  const { whiteVar, ar1Var, rho } = best;
  return { whiteVar, ar1Var, rho, longRunSigma: Math.sqrt(whiteVar + (ar1Var * (1 + rho)) / (1 - rho)) };
}

/**
 * ρ^k at fitVariogram's lags for each ρ of its grid, kept for the last lags asked (every layer's
 * variogram has the same lags, so each layer's fit would compute the same powers again).
 */
function gridPowers(lags: readonly number[], rhoMax: number): Float64Array[] {
  const key = `${rhoMax} ${lags.join(',')}`;
  if (keptPowers?.key !== key) keptPowers = { key, powers: Array.from({ length: 201 }, (_, g) => powersAtLags(lags, (g / 200) * rhoMax)) };
  return keptPowers.powers;
}
let keptPowers: { key: string; powers: Float64Array[] } | null = null;

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
  // Four series a pass where they do not overlap (a Jacobian's columns): each recursion waits on
  // its own last step, and four side by side keep the processor busy meanwhile; each series'
  // operations are its own and in its own order, so the same figures as one at a time.
  let s = 0;
  for (; s + 4 <= series.length && apart(series, s, 4); s += 4) whitenFour(series[s], series[s + 1], series[s + 2], series[s + 3], rho, gain, scale, from, to);
  for (; s < series.length; s++) whitenOne(series[s], rho, gain, scale, from, to);
}

/** whitenAr1PlusWhite's filter on one series, its gains and scales computed. */
function whitenOne(y: Float64Array, rho: number, gain: Float64Array, scale: Float64Array, from: number, to: number): void {
  let xhat = 0;
  for (let i = from; i < to; i++) {
    const pred = i === from ? 0 : rho * xhat;
    const innov = y[i] - pred;
    xhat = pred + gain[i - from] * innov;
    y[i] = innov * scale[i - from];
  }
}

/** whitenOne on four series that share no element, side by side. */
function whitenFour(
  a: Float64Array, b: Float64Array, c: Float64Array, d: Float64Array, rho: number, gain: Float64Array, scale: Float64Array, from: number, to: number,
): void {
  let xa = 0, xb = 0, xc = 0, xd = 0;
  for (let i = from; i < to; i++) {
    const g = gain[i - from], f = scale[i - from];
    const pa = i === from ? 0 : rho * xa, pb = i === from ? 0 : rho * xb, pc = i === from ? 0 : rho * xc, pd = i === from ? 0 : rho * xd;
    const ia = a[i] - pa, ib = b[i] - pb, ic = c[i] - pc, id = d[i] - pd;
    xa = pa + g * ia;
    xb = pb + g * ib;
    xc = pc + g * ic;
    xd = pd + g * id;
    a[i] = ia * f;
    b[i] = ib * f;
    c[i] = ic * f;
    d[i] = id * f;
  }
}

/** True when series[s … s + k − 1] share no element (distinct buffers, or ranges of one that do not meet). */
function apart(series: readonly Float64Array[], s: number, k: number): boolean {
  for (let i = s; i < s + k; i++) {
    for (let j = i + 1; j < s + k; j++) {
      const x = series[i], y = series[j];
      if (x.buffer === y.buffer && x.byteOffset < y.byteOffset + y.byteLength && y.byteOffset < x.byteOffset + x.byteLength) return false;
    }
  }
  return true;
}
