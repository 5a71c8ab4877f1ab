import { type Ar1PlusWhite } from './correlatedNoise';
import { fitVariogramLineInto, powersAtLags } from './variogramLine';

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
  addStretchSums(stretchSums(e, v), e.length, v);
}

/** One stretch's ½·Σ(e_{i+k} − e_i)² at the pool's lags up to half its length (what addToLongVariogram adds). */
export function stretchSums(e: ArrayLike<number>, v: LongVariogram): Float64Array {
  const n = e.length;
  const x = Float64Array.from(e);
  const out: number[] = [];
  for (let q = 0; q < v.lags.length && v.lags[q] <= n / 2; q++) out.push(squaredDifferences(x, v.lags[q]) / 2);
  return Float64Array.from(out);
}

/** Adds a stretch of n values by its stretchSums (the same additions as addToLongVariogram). */
export function addStretchSums(sums: Float64Array, n: number, v: LongVariogram): void {
  for (let q = 0; q < sums.length; q++) {
    v.sums[q] += sums[q];
    v.counts[q] += n - v.lags[q];
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
  // ρ^k at each ρ of the grid: the same in every pass
  const powers = grid.map((rho) => powersAtLags(lags, rho));
  const fit = new Float64Array(3);
  const gammaAt = Float64Array.from(gamma);
  for (let pass = 0; pass < 3; pass++) {
    const w = Float64Array.from(model.map((m, q) => (m > 0 ? count[q] / (m * m) : 0)));
    best = { ssr: Infinity, A: gamma[0], B: 0, rho: 0 };
    for (const [g, rho] of grid.entries()) {
      fitVariogramLineInto(gammaAt, w, rho, powers[g], fit);
      if (fit[0] < best.ssr) best = { ssr: fit[0], A: fit[1], B: fit[2], rho };
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
