import { normalCdf } from './growthPosterior';

/**
 * The normal distribution N(m, v²) cut to [lo, hi], in closed form: its mass, mean and σ. With
 * a = (lo − m)/v, b = (hi − m)/v and P = Φ(b) − Φ(a),
 *   mean = m + v·(φ(a) − φ(b))/P,
 *   var  = v²·[1 + (a·φ(a) − b·φ(b))/P − ((φ(a) − φ(b))/P)²]
 * (N. L. Johnson, S. Kotz, N. Balakrishnan, Continuous Univariate Distributions, vol. 1, 2nd ed.
 * (1994), ch. 13, §10.1, truncated normal moments; from memory). Far in a tail both φ and P
 * underflow: there the ratios are taken through Mills' ratio R(x) = (1 − Φ(x))/φ(x), by Laplace's
 * continued fraction (Abramowitz and Stegun 26.2.14) beyond 2.5, so a normal whose mean lies
 * many σ below 0, cut at 0, still gives its mass (as a log) and its mean (about v²/|m| above 0).
 */
export interface TruncatedNormal {
  mean: number;
  sigma: number;
  /** log P, the mass of N(m, v²) within [lo, hi]. */
  logMass: number;
}

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** Mills' ratio (1 − Φ(x))/φ(x), x ≥ 0. */
export function millsRatio(x: number): number {
  if (x < 2.5) return normalCdf(-x) / Math.exp(-0.5 * x * x - LOG_SQRT_2PI);
  // 1/(x + 1/(x + 2/(x + 3/(x + …)))), evaluated from the 60th term back.
  let t = x;
  for (let k = 60; k >= 1; k--) t = x + k / t;
  return 1 / t;
}

/** log(1 − Φ(x)) for any x. */
export function logUpperTail(x: number): number {
  if (x >= 0) return -0.5 * x * x - LOG_SQRT_2PI + Math.log(millsRatio(x));
  return Math.log1p(-Math.exp(logUpperTail(-x)));
}

export function truncatedNormal(m: number, v: number, lo: number, hi: number): TruncatedNormal {
  if (!(v > 0)) {
    const at = Math.min(Math.max(m, lo), hi);
    return { mean: at, sigma: 0, logMass: m >= lo && m <= hi ? 0 : -Infinity };
  }
  const a = (lo - m) / v, b = (hi - m) / v;
  if (b <= 0) {
    // The lower tail: the mirror image of the upper one.
    const r = truncatedNormal(-m, v, -hi, -lo);
    return { mean: -r.mean, sigma: r.sigma, logMass: r.logMass };
  }
  if (a >= 0) {
    // Both bounds in the upper tail: every ratio relative to φ(a).
    const ra = millsRatio(a);
    const eb = b === Infinity ? 0 : Math.exp(0.5 * (a * a - b * b)), rb = b === Infinity ? 0 : millsRatio(b);
    const pOverPhiA = ra - rb * eb;
    const logMass = -0.5 * a * a - LOG_SQRT_2PI + Math.log(Math.max(pOverPhiA, 1e-300));
    if (a > 40 && b - a > 10 / a) {
      // Nearly an exponential of rate a/v from lo (the relative terms dropped are O(1/a²)).
      return { mean: lo + v / a, sigma: v / a, logMass };
    }
    const la = 1 / pOverPhiA, lb = eb / pOverPhiA;
    const bTerm = b === Infinity ? 0 : b * lb;
    const mean = m + v * (la - lb);
    const varUnit = 1 + a * la - bTerm - (la - lb) ** 2;
    return { mean: Math.min(Math.max(mean, lo), hi), sigma: v * Math.sqrt(Math.max(varUnit, 0)), logMass };
  }
  // a < 0 < b: the mass is at least Φ(b) − 1/2 + 1/2 − Φ(a), computed directly.
  const qa = a === -Infinity ? 0 : Math.exp(logUpperTail(-a)), qb = b === Infinity ? 0 : Math.exp(logUpperTail(b));
  const P = Math.max(1 - qa - qb, 1e-300);
  const pa = a === -Infinity ? 0 : Math.exp(-0.5 * a * a - LOG_SQRT_2PI), pb = b === Infinity ? 0 : Math.exp(-0.5 * b * b - LOG_SQRT_2PI);
  const aTerm = a === -Infinity ? 0 : a * pa, bTerm = b === Infinity ? 0 : b * pb;
  const mean = m + (v * (pa - pb)) / P;
  const varUnit = 1 + (aTerm - bTerm) / P - ((pa - pb) / P) ** 2;
  return { mean: Math.min(Math.max(mean, lo), hi), sigma: v * Math.sqrt(Math.max(varUnit, 0)), logMass: Math.log(P) };
}

/** One normal component N(mean, sigma²) of a population, cut to [0, max] where used, with its weight. */
export interface PopulationComponent {
  meanNm: number;
  sigmaNm: number;
  weight: number;
}

/**
 * The posterior mean and σ of x = y + ε, ε ~ N(0, s²) (the growth counted from a thickness of
 * σ s), where the true growth y has the prior Σₖ wₖ·N(μₖ, τₖ²) with each component cut to
 * [0, max] (the run's shutter times as a population cut at 0, carried over its own (μ, τ)
 * uncertainty) and x is seen through the Gaussian g ± σ_g (none: `evidence` null). Integrating
 * x out, y's likelihood is N(g; y, S²), S² = s² + σ_g²; each component times it is a normal cut
 * to [0, max] (the product of two Gaussians): N(y; mₖ, vₖ²) with mₖ = (μₖS² + gτₖ²)/(τₖ² + S²),
 * vₖ = τₖS/√(τₖ² + S²), its weight wₖ·N(g; μₖ, τₖ² + S²)·Pₖ(post)/Pₖ(prior) (each component's
 * own mass under the cut: a component far below 0 is a pile at 0, whatever its spread). Its
 * mean and σ by truncatedNormal; then x | y is normal with mean (y·σ_g² + g·s²)/S² and variance
 * s²σ_g²/S². The mixture's mean and variance by the law of total variance.
 */
export function populationPosterior(
  population: readonly PopulationComponent[], maxNm: number, evidence: { meanNm: number; sigmaNm: number } | null, smoothNm = 0,
): { deltaNm: number; sigmaNm: number } {
  const s2 = smoothNm * smoothNm;
  const logW: number[] = [], mom: TruncatedNormal[] = [];
  for (const c of population) {
    if (!(c.weight > 0)) continue;
    const prior = truncatedNormal(c.meanNm, c.sigmaNm, 0, maxNm);
    if (!evidence) {
      logW.push(Math.log(c.weight));
      mom.push(prior);
      continue;
    }
    const S2 = s2 + evidence.sigmaNm ** 2, t2 = c.sigmaNm * c.sigmaNm, v2 = t2 + S2;
    const m = (c.meanNm * S2 + evidence.meanNm * t2) / v2, v = Math.sqrt((t2 * S2) / v2);
    const post = truncatedNormal(m, v, 0, maxNm);
    logW.push(Math.log(c.weight) - 0.5 * (evidence.meanNm - c.meanNm) ** 2 / v2 - 0.5 * Math.log(v2) + post.logMass - prior.logMass);
    mom.push(post);
  }
  if (mom.length === 0) return { deltaNm: 0, sigmaNm: 0 };
  const top = Math.max(...logW.filter((x) => Number.isFinite(x)), -Infinity);
  let w0 = 0, w1 = 0, w2 = 0;
  mom.forEach((p, k) => {
    const w = Number.isFinite(logW[k]) ? Math.exp(logW[k] - top) : 0;
    w0 += w;
    w1 += w * p.mean;
    w2 += w * (p.sigma * p.sigma + p.mean * p.mean);
  });
  const ey = w1 / w0, vy = Math.max(w2 / w0 - ey * ey, 0);
  if (!evidence) return { deltaNm: ey, sigmaNm: Math.sqrt(vy + s2) };
  const S2 = s2 + evidence.sigmaNm ** 2, a = evidence.sigmaNm ** 2 / S2;
  return { deltaNm: a * ey + (evidence.meanNm * s2) / S2, sigmaNm: Math.sqrt(a * a * vy + (s2 * evidence.sigmaNm ** 2) / S2) };
}
