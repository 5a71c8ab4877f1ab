import { type Ar1PlusWhite } from './correlatedNoise';

/**
 * The semivariogram γ(k) = ½·E(e_{i+k} − e_i)² of a noise, pooled over stretches of different
 * lengths, each at a level of its own: sums of ½·(e_{i+k} − e_i)² and their counts per lag.
 * Differences need no mean, so a stretch's unknown level biases no lag (Matheron's estimator;
 * N. Cressie, "Statistics for Spatial Data", Wiley (1993), §2.4, from memory), unlike the
 * autocovariance about a stretch's own mean, which is short by Var(x̄) at every lag: for a 3 s
 * stretch of noise with 1 s memory that is about half the AR(1) variance.
 *
 * The lags: every one up to 32, then each about 3 % beyond the last (a correlation time of many
 * samples is told by the variogram's rise over a few times itself, not by each lag of it).
 */
export interface LongVariogram {
  lags: Int32Array;
  /** Σ ½·(e_{i+k} − e_i)² over every stretch, and the number of pairs, at lags[q]. */
  sums: Float64Array;
  counts: Float64Array;
}

export function newLongVariogram(maxLag: number): LongVariogram {
  const lags: number[] = [];
  for (let k = 1; k <= maxLag; k += Math.max(1, Math.ceil(k / 32))) lags.push(k);
  return { lags: Int32Array.from(lags), sums: new Float64Array(lags.length), counts: new Float64Array(lags.length) };
}

/**
 * Adds one stretch at its lags up to half its length (the usual limit of a variogram's reliable
 * lags; A. G. Journel, C. J. Huijbregts, "Mining Geostatistics", Academic Press (1978), from
 * memory).
 */
export function addToLongVariogram(e: ArrayLike<number>, v: LongVariogram): void {
  const n = e.length;
  const x = Float64Array.from(e);
  for (let q = 0; q < v.lags.length && v.lags[q] <= n / 2; q++) {
    const k = v.lags[q];
    v.sums[q] += squaredDifferences(x, k) / 2;
    v.counts[q] += n - k;
  }
}

function squaredDifferences(x: Float64Array, k: number): number {
  let s = 0;
  for (let i = 0; i + k < x.length; i++) {
    const d = x[i + k] - x[i];
    s += d * d;
  }
  return s;
}

/**
 * White plus AR(1) noise, γ(k) = σ_w² + σ_x²·(1 − ρ^k) (the AR(1) autocorrelation ρ^k, G. E. P.
 * Box, G. M. Jenkins, "Time Series Analysis", Holden-Day (1970), §3.2; white and AR(1) parts
 * independent), fitted to the pooled variogram at every lag by Cressie's weighted least squares:
 * Σ_k N_k·(γ̂_k/γ(k) − 1)², each lag weighted by its pairs over the model's γ² (N. Cressie,
 * "Fitting variogram models by weighted least squares", Math. Geol. 17, 563–586 (1985)), so the
 * many long lags that tell the sill count as much as their pairs allow. For each ρ on a grid of
 * correlation times (log-spaced) the fit is linear in (σ_w² + σ_x², σ_x²); the weights are renewed
 * from the fitted model twice. The correlation time goes up to the longest lag over 1.2
 * (ρ^L ≥ 0.3): a slower part is not told from a level change. Null with fewer than 3 lags.
 */
export function fitLongVariogram(v: LongVariogram): Ar1PlusWhite | null {
  const lags: number[] = [], gamma: number[] = [], count: number[] = [];
  v.lags.forEach((k, q) => {
    if (v.counts[q] > 0) {
      lags.push(k);
      gamma.push(v.sums[q] / v.counts[q]);
      count.push(v.counts[q]);
    }
  });
  if (lags.length < 3) return null;
  const L = lags[lags.length - 1];
  const tauMax = L / Math.log(1 / 0.3);
  const grid = [0];
  const GRID = 160;
  for (let g = 0; g <= GRID; g++) grid.push(Math.exp(-1 / (0.2 * (tauMax / 0.2) ** (g / GRID))));
  let model = gamma.slice();
  let best = { ssr: Infinity, A: gamma[0], B: 0, rho: 0 };
  for (let pass = 0; pass < 3; pass++) {
    const w = model.map((m, q) => (m > 0 ? count[q] / (m * m) : 0));
    best = { ssr: Infinity, A: gamma[0], B: 0, rho: 0 };
    for (const rho of grid) {
      const fit = linearPart(lags, gamma, w, rho);
      if (fit.ssr < best.ssr) best = { ...fit, rho };
    }
    const { A, B, rho } = best;
    const next = lags.map((k) => A - B * rho ** k);
    // The model's γ must stay positive for the weights: keep the data's where it does not.
    model = next.map((m, q) => (m > 0 ? m : gamma[q]));
  }
  const { A, B, rho } = best;
  const whiteVar = Math.max(0, A - B), ar1Var = B;
  return { whiteVar, ar1Var, rho, longRunSigma: Math.sqrt(whiteVar + (rho < 1 ? (ar1Var * (1 + rho)) / (1 - rho) : 0)) };
}

/** Weighted least squares of γ(k) = A − B·ρ^k in (A, B) at one ρ, with 0 ≤ B ≤ A. */
function linearPart(lags: readonly number[], gamma: readonly number[], w: readonly number[], rho: number): { ssr: number; A: number; B: number } {
  const logRho = rho > 0 ? Math.log(rho) : -Infinity;
  let s1 = 0, sx = 0, sxx = 0, sy = 0, sxy = 0;
  const x = lags.map((k) => Math.exp(k * logRho));
  for (let q = 0; q < lags.length; q++) {
    s1 += w[q]; sx += w[q] * x[q]; sxx += w[q] * x[q] * x[q]; sy += w[q] * gamma[q]; sxy += w[q] * x[q] * gamma[q];
  }
  const det = s1 * sxx - sx * sx;
  let A: number, B: number;
  if (rho > 0 && det > 1e-12 * s1 * sxx) {
    A = (sy * sxx - sx * sxy) / det;
    B = -(s1 * sxy - sx * sy) / det;
  } else {
    A = sy / s1;
    B = 0;
  }
  if (B < 0) {
    // no AR(1) part: γ flat
    B = 0;
    A = sy / s1;
  } else if (B > A) {
    // no white part: γ = B·(1 − ρ^k)
    let num = 0, den = 0;
    for (let q = 0; q < lags.length; q++) {
      num += w[q] * gamma[q] * (1 - x[q]);
      den += w[q] * (1 - x[q]) ** 2;
    }
    A = B = den > 0 ? num / den : 0;
  }
  let ssr = 0;
  for (let q = 0; q < lags.length; q++) ssr += w[q] * (gamma[q] - (A - B * x[q])) ** 2;
  return { ssr, A, B };
}
