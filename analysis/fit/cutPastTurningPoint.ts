import { type LayerAt } from '../optics';
import { modelTurningPoints } from './cutTiming';
import { type MonitorOptics } from './layerModel';

/** Standard normal density and distribution function (Abramowitz & Stegun 7.1.26 for erf, |error| < 1.5e-7). */
const phi = (z: number) => Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
function Phi(z: number): number {
  const x = Math.abs(z) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * x);
  const erf = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-x * x);
  return z >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
}

/**
 * Mean and σ of a normal N(mean, sigma²) restricted to [lo, hi] (the truncated normal's first two
 * moments, N. L. Johnson, S. Kotz & N. Balakrishnan, Continuous Univariate Distributions vol. 1,
 * 2nd ed., §10.1, from memory): the posterior of a Gaussian reading under a uniform prior on
 * [lo, hi]. Where the interval lies so far out that its probability underflows, its nearer edge.
 */
export function truncatedNormalMoments(mean: number, sigma: number, lo: number, hi: number): { mean: number; sigma: number } {
  if (!(sigma > 0)) return { mean: Math.min(Math.max(mean, lo), hi), sigma: 0 };
  const a = (lo - mean) / sigma, b = (hi - mean) / sigma;
  const z = Phi(b) - Phi(a);
  if (!(z > 1e-12)) {
    const edge = mean < lo ? lo : hi;
    return { mean: edge, sigma: 0 };
  }
  const m = (phi(a) - phi(b)) / z;
  const v = 1 + (a * phi(a) - b * phi(b)) / z - m * m;
  return { mean: mean + sigma * m, sigma: sigma * Math.sqrt(Math.max(v, 0)) };
}

/** The modelled turning point of a layer (index, extinction, on `below`) nearest endNm, within 10 % of it; null without one. */
export function turningPointNearNm(optics: MonitorOptics, below: readonly LayerAt[], index: number, extinction: number, endNm: number): number | null {
  let best: number | null = null;
  for (const tp of modelTurningPoints(optics, below, index, extinction, endNm * 1.2)) {
    if (Math.abs(tp.thicknessNm - endNm) <= 0.1 * endNm && (best === null || Math.abs(tp.thicknessNm - endNm) < Math.abs(best - endNm))) best = tp.thicknessNm;
  }
  return best;
}

/**
 * A turning-point cut's thickness at its last logged sample, where nothing above pins it (the
 * chip's last layer): the controller cut after it saw the turning point, so the film then lay at
 * or past the fitted layer's turning point d_TP, by no more than its overshoot (up to
 * overshootPct of the layer). The fit's own reading there (Gaussian, its σ) tells little of which
 * side: near a turning point the signal is quadratic in the thickness. Its posterior under the
 * uniform prior on [d_TP, d_TP·(1 + overshootPct/100)] (truncatedNormalMoments), the mean only:
 * d_TP itself carries the index's and the stack's errors, which the fit's σ holds.
 */
export function cutPastTurningPointNm(loggedNm: number, sigmaNm: number, turningPointNm: number, overshootPct: number): number {
  const hi = turningPointNm * (1 + Math.max(overshootPct, 0) / 100);
  return truncatedNormalMoments(loggedNm, sigmaNm, turningPointNm, hi).mean;
}
