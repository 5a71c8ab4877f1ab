import { populationPosterior, type PopulationComponent } from './truncatedNormal';

/** Simpson intervals over the part of the interval within ±12σ of the mean (h ≤ 0.012σ there). */
const SIMPSON_INTERVALS = 2000;

/**
 * Mean and σ of a normal N(mean, sigma²) restricted to [lo, hi]: the posterior of a Gaussian
 * reading under a uniform prior on [lo, hi] (the truncated normal; its closed form, N. L. Johnson,
 * S. Kotz & N. Balakrishnan, Continuous Univariate Distributions vol. 1, 2nd ed., §10.1, from
 * memory, loses its variance to cancellation where σ is wide against the interval, so the two
 * moments are integrated by Simpson's rule over the interval's part within 12σ of the mean, the
 * density scaled to 1 at its highest point there). Where that part is empty, its nearer edge.
 */
export function truncatedNormalMoments(mean: number, sigma: number, lo: number, hi: number): { mean: number; sigma: number } {
  if (!(sigma > 0)) return { mean: Math.min(Math.max(mean, lo), hi), sigma: 0 };
  const a = Math.max(lo, mean - 12 * sigma), b = Math.min(hi, mean + 12 * sigma);
  if (!(b > a)) return { mean: mean < lo ? lo : hi, sigma: 0 };
  const peak = Math.min(Math.max(mean, a), b);
  const logDensity = (x: number) => -0.5 * (((x - mean) / sigma) ** 2 - ((peak - mean) / sigma) ** 2);
  const h = (b - a) / SIMPSON_INTERVALS;
  let w0 = 0, w1 = 0;
  const xs = new Float64Array(SIMPSON_INTERVALS + 1), ws = new Float64Array(SIMPSON_INTERVALS + 1);
  for (let i = 0; i <= SIMPSON_INTERVALS; i++) {
    const x = a + i * h;
    const w = (i === 0 || i === SIMPSON_INTERVALS ? 1 : i % 2 === 1 ? 4 : 2) * Math.exp(logDensity(x));
    xs[i] = x;
    ws[i] = w;
    w0 += w;
    w1 += w * x;
  }
  const m = w1 / w0;
  let w2 = 0;
  for (let i = 0; i <= SIMPSON_INTERVALS; i++) w2 += ws[i] * (xs[i] - m) ** 2;
  return { mean: m, sigma: Math.sqrt(w2 / w0) };
}

/**
 * A turning-point cut's thickness at its last logged sample, where nothing above pins it (the
 * chip's last layer): the controller cut after it saw the turning point, so the film then lay at
 * or past the fitted layer's turning point d_TP, by no more than its overshoot (up to
 * overshootPct of the layer). The fit's own reading there (Gaussian, its σ) tells little of which
 * side: near a turning point the signal is quadratic in the thickness. Its posterior under the
 * uniform prior on [d_TP, d_TP·(1 + overshootPct/100)] (truncatedNormalMoments), or the run's
 * overshoot population where given, the mean here: d_TP itself carries the index's and the
 * stack's errors, which the fit's σ holds; the caller narrows σ by what the prior told of the
 * end relative to d_TP alone (endSigmaAfterPrior).
 */
/**
 * Whether a reading of σ could show a cut later than the controller's overshoot allows (width
 * `widthNm`): only then does cutPastTurningPointNm's gate let a late cut through, so only then is
 * the prior applied (the caller's check, on the σ the posterior is taken with). Where σ is wider than the interval, the prior would pull any late cut into it: the
 * demo's single MgF2 layer, cut 6.3 % QWOT late (a hand cut) and read +3.0 ± 2.5 % QWOT, read
 * +0.5 % with the prior, which hides exactly what the operator reviews.
 */
export function overshootSeen(sigmaNm: number, widthNm: number): boolean {
  return sigmaNm <= widthNm;
}

export function cutPastTurningPointNm(loggedNm: number, sigmaNm: number, turningPointNm: number, overshootPct: number, run: RunOvershoot | null = null): number {
  const hi = turningPointNm * (1 + Math.max(overshootPct, 0) / 100);
  // A reading beyond CONTRADICTS σ outside the interval says the controller did not cut so: the reading stands.
  if (loggedNm < turningPointNm - CONTRADICTS * sigmaNm || loggedNm > hi + CONTRADICTS * sigmaNm) return loggedNm;
  return turningPointNm + overshootPosterior(loggedNm - turningPointNm, sigmaNm, hi - turningPointNm, turningPointNm, run).mean;
}

/**
 * The controller's overshoot as the run's other turning-point cuts show it, % of the layer: the
 * population N(mean, spread²) cut at 0 of their ends read relative to their fitted turning points
 * (each pinned by the layer above it), by marginal maximum likelihood (shutterTime's
 * truncatedPopulation). A chip's last cut takes it as its prior in place of the uniform one.
 */
export interface RunOvershoot {
  meanPct: number;
  spreadPct: number;
  /** The population over its own (μ, τ) posterior (shutterTime's populationMixture), % of the layer: used in place of the point estimate where given. */
  components?: readonly PopulationComponent[];
}

/**
 * Posterior mean and σ of x = d_end − d_TP, nm, from its reading x̂ ± σ: under the run's
 * overshoot population where known (the product of the two Gaussians, then cut to [0, hi]), else
 * under the uniform prior on [0, hi].
 */
export function overshootPosterior(x: number, sigmaNm: number, hiNm: number, turningPointNm: number, run: RunOvershoot | null): { mean: number; sigma: number } {
  if (!run) return truncatedNormalMoments(x, sigmaNm, 0, hiNm);
  if (run.components) {
    const k = turningPointNm / 100;
    const population = run.components.map((c) => ({ meanNm: c.meanNm * k, sigmaNm: c.sigmaNm * k, weight: c.weight }));
    const p = populationPosterior(population, hiNm, { meanNm: x, sigmaNm });
    return { mean: p.deltaNm, sigma: p.sigmaNm };
  }
  const mu = (run.meanPct * turningPointNm) / 100, tau = (run.spreadPct * turningPointNm) / 100;
  const v = sigmaNm * sigmaNm + tau * tau;
  const m = (x * tau * tau + mu * sigmaNm * sigmaNm) / v, s = (sigmaNm * tau) / Math.sqrt(v);
  return truncatedNormalMoments(m, s, 0, hiNm);
}

/**
 * σ of the fit's reading beyond which, outside [d_TP, d_TP + overshoot], the reading contradicts the
 * prior and is kept as it is. Synthetic traces whose turning-point layers were cut at the design's
 * thickness ±0.4 % (analysis/synth as it was, 18-layer mirror, refit, seeds 11–13 and 21–24: cuts up
 * to 1.2 % before the turning point, σ_d about 0.2 %) read up to 1.8 % off at 9σ held to the interval.
 */
const CONTRADICTS = 2;

/**
 * The same posterior on the reading of the end relative to the fitted turning point,
 * x = d_end − d_TP: an error the end and the turning point share (the stack below, the detector's
 * offset or gain) moves both and leaves x as it is, so only the layer's own errors enter. With e
 * the end's error and e_x = e − e_TP the relative reading's (σ sigmaNm), x's posterior under the
 * uniform prior on [0, d_TP·overshootPct/100] moves the end by beta·(E[x] − x̂), beta =
 * cov(e, e_x)/var(e_x), the regression of the end's error on the relative one (the conditional
 * mean of jointly normal errors). The caller decides first whether the reading contradicts the
 * prior (cutPastTurningPointNm's gate on the whole σ). Returns that shift in nm.
 */
export function relativeCutShiftNm(loggedNm: number, turningPointNm: number, sigmaNm: number, beta: number, overshootPct: number, run: RunOvershoot | null = null): number {
  const x = loggedNm - turningPointNm, hi = turningPointNm * (Math.max(overshootPct, 0) / 100);
  return beta * (overshootPosterior(x, sigmaNm, hi, turningPointNm, run).mean - x);
}

/**
 * σ of the end's reading relative to the turning point and beta (relativeCutShiftNm) from the
 * fit's own covariance of the end d and the index n (dd, nn, dn) and dTpDn, the turning point's
 * change with the index (first order: e_TP = dTpDn·e_n); null where that variance is not positive.
 */
export function relativeCut(own: { dd: number; nn: number; dn: number }, dTpDn: number): { sigmaNm: number; beta: number } | null {
  const v = own.dd + dTpDn * dTpDn * own.nn - 2 * dTpDn * own.dn;
  if (!(v > 0)) return null;
  return { sigmaNm: Math.sqrt(v), beta: (own.dd - dTpDn * own.dn) / v };
}

/**
 * σ of the end once the prior has moved it: with the end's error e = β·e_x + r (e_x the relative
 * reading's error, σ `relSigmaNm`; r apart from it, the rest of the whole σ), the posterior of x
 * (σ `postSigmaNm`) takes the place of the reading, so var(e) falls by β²·(σ_x² − σ_post²); never
 * below the posterior's own share, (β·σ_post)² (the conditional variance of jointly normal errors
 * and the law of total variance, as in any multivariate-normal text; from memory).
 */
export function endSigmaAfterPrior(wholeSigmaNm: number, relSigmaNm: number, beta: number, postSigmaNm: number): number {
  const told = beta * beta * Math.max(0, relSigmaNm * relSigmaNm - postSigmaNm * postSigmaNm);
  return Math.sqrt(Math.max(wholeSigmaNm * wholeSigmaNm - told, (beta * postSigmaNm) ** 2));
}
