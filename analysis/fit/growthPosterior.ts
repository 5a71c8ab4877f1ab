import { populationPosterior, truncatedNormal, type PopulationComponent } from './truncatedNormal';

/** One Gaussian piece of evidence on the growth after a cut, nm. */
export interface GaussianEvidence {
  meanNm: number;
  sigmaNm: number;
}

export interface GrowthEvidence {
  /** Most growth considered, nm (the final rate times the longest shutter time). */
  maxNm: number;
  /** A reading predicted for each growth, against an observed level with its σ (the settled idle level). */
  level?: {
    predict: (deltaNm: ArrayLike<number>) => Float64Array; observed: number; sigma: number;
    /** A σ growing with the growth (the curve's slope uncertain at the end), added in quadrature: sigmaPerNm·δ. */
    sigmaPerNm?: number;
  };
  /** Gaussian likelihoods of the growth (the next layer's start, a joint fit's marginal). */
  gaussians?: readonly GaussianEvidence[];
  /** A Gaussian prior on the true growth within [0, maxNm] (the run's shutter time). */
  prior?: GaussianEvidence;
  /**
   * In place of `prior`: the run's shutter times as a mixture of normals, each cut to [0, maxNm]
   * on its own (its own mass under the cut: truncatedNormal.ts populationPosterior).
   */
  population?: readonly PopulationComponent[];
  /**
   * σ of the thickness the growth is counted from (the fitted thickness at the last logged
   * sample). The growth sought is then the final thickness minus that estimate, and its prior is
   * the true growth's smeared by this σ; the evidence (level, next layer) is on the final
   * thickness, so the posterior's σ is that of the final thickness. @default 0
   */
  smoothNm?: number;
}

export interface GrowthEstimate {
  /** Posterior mean and σ of the growth, nm. */
  deltaNm: number;
  sigmaNm: number;
}

const GRID = 401;

/**
 * The growth after a cut from every piece of evidence on it, as a posterior on a grid: a flat
 * prior on [0, maxNm] (the film does not shrink; a shutter closes within the longest time
 * considered), times the run's shutter time (`prior`), smeared by the σ of the thickness it is
 * counted from (`smoothNm`), times the level's likelihood (Gaussian in the reading, so not
 * Gaussian in δ where the curve turns) and the Gaussian likelihoods (the next layer's start, a
 * joint fit's marginal). Mean and σ of the posterior; further passes refine the grid around it,
 * so a posterior far narrower than the prior is still resolved. Bayes' rule on a grid, e.g.
 * D. S. Sivia, Data Analysis: A Bayesian Tutorial, 2nd ed. (2006), ch. 2 (from memory).
 */
export function growthPosterior(e: GrowthEvidence): GrowthEstimate {
  const smooth = e.smoothNm ?? 0;
  // Gaussian evidence only, under the run's shutter times (a population, or the one Gaussian
  // `prior`, a population of one): the posterior's moments in closed form (truncatedNormal.ts
  // populationPosterior), as the grid below would integrate them (fit/__tests__/growthPosterior.test.ts).
  // On the bench's 40-layer run the grid took about 0.05 s of the main thread's CPU.
  const population = e.population?.length ? e.population : e.prior ? [{ ...e.prior, weight: 1 }] : null;
  if (population && !e.level) {
    let w = 0, wm = 0;
    for (const g of e.gaussians ?? []) {
      w += 1 / g.sigmaNm ** 2;
      wm += g.meanNm / g.sigmaNm ** 2;
    }
    return populationPosterior(population, Math.max(e.maxNm, 1e-12), w > 0 ? { meanNm: wm / w, sigmaNm: 1 / Math.sqrt(w) } : null, smooth);
  }
  const [lo0, hi0] = [-6 * smooth, Math.max(e.maxNm, 1e-12) + 6 * smooth];
  let [lo, hi] = [lo0, hi0];
  let out = moments(e, lo, hi);
  for (let pass = 0; pass < 3; pass++) {
    const half = Math.max(8 * out.sigmaNm, (4 * (hi - lo)) / (GRID - 1));
    const nlo = Math.max(lo0, out.deltaNm - half), nhi = Math.min(hi0, out.deltaNm + half);
    if (!(nhi > nlo) || nhi - nlo > 0.5 * (hi - lo)) break;
    [lo, hi] = [nlo, nhi];
    out = moments(e, lo, hi);
  }
  return out;
}

/**
 * Log-prior of the growth counted from an estimate: flat on [0, max] times the Gaussian prior,
 * smeared by N(0, smooth²); the integral in closed form by the product of two Gaussians.
 */
function logPrior(e: GrowthEvidence, x: number): number {
  const s = e.smoothNm ?? 0, max = e.maxNm, p = e.prior;
  if (e.population?.length) return logPopulationPrior(e.population, max, s, x);
  if (!(s > 0)) {
    if (x < 0 || x > max) return -Infinity;
    return p ? -0.5 * ((x - p.meanNm) / p.sigmaNm) ** 2 : 0;
  }
  if (!p) return Math.log(Math.max(normalCdf(x / s) - normalCdf((x - max) / s), 1e-300));
  const v2 = p.sigmaNm ** 2 + s * s;
  const mx = (p.meanNm * s * s + x * p.sigmaNm ** 2) / v2, v = (p.sigmaNm * s) / Math.sqrt(v2);
  return -0.5 * ((x - p.meanNm) ** 2) / v2 + logCdfDifference(-mx / v, (max - mx) / v);
}

/** log Φ(x), with the tail's asymptotic series where Φ underflows (Abramowitz and Stegun 26.2.12). */
export function logNormalCdf(x: number): number {
  if (x > -6) return Math.log(Math.max(normalCdf(x), 1e-300));
  const x2 = x * x;
  return -0.5 * x2 - Math.log(-x) - 0.5 * Math.log(2 * Math.PI) + Math.log(1 - 1 / x2 + 3 / (x2 * x2));
}

/**
 * log(Φ(b) − Φ(a)), a < b, in the tail it lies in: a prior piled far below 0 (the run's shutter
 * time cut at 0) puts both deep in one tail, where their difference underflowed.
 */
function logCdfDifference(a: number, b: number): number {
  // Φ(b) − Φ(a) = Φ(−a) − Φ(−b): take the side where the larger term is not near 1.
  const [hi, lo] = a > 0 ? [logNormalCdf(-a), logNormalCdf(-b)] : [logNormalCdf(b), logNormalCdf(a)];
  if (!(hi > -Infinity)) return -690;
  return hi + Math.log(Math.max(-Math.expm1(lo - hi), 1e-300));
}

/**
 * log Σₖ wₖ·[N(μₖ, τₖ²) cut to [0, max], smeared by N(0, s²)](x): each component as logPrior's
 * single Gaussian, over its own mass in [0, max].
 */
const massCache = new WeakMap<readonly PopulationComponent[], { max: number; z: number[] }>();

function logPopulationPrior(population: readonly PopulationComponent[], max: number, s: number, x: number): number {
  let cached = massCache.get(population);
  if (!cached || cached.max !== max) massCache.set(population, (cached = { max, z: population.map((c) => truncatedNormal(c.meanNm, c.sigmaNm, 0, max).logMass) }));
  const terms: number[] = [];
  for (const [k, c] of population.entries()) {
    if (!(c.weight > 0)) continue;
    const z = cached.z[k];
    let t: number;
    if (!(s > 0)) {
      if (x < 0 || x > max) return -Infinity;
      t = -0.5 * ((x - c.meanNm) / c.sigmaNm) ** 2 - Math.log(c.sigmaNm);
    } else {
      const v2 = c.sigmaNm ** 2 + s * s;
      const mx = (c.meanNm * s * s + x * c.sigmaNm ** 2) / v2, v = (c.sigmaNm * s) / Math.sqrt(v2);
      t = -0.5 * ((x - c.meanNm) ** 2) / v2 - 0.5 * Math.log(v2) + truncatedNormal(mx, v, 0, max).logMass;
    }
    terms.push(Math.log(c.weight) + t - z);
  }
  const top = Math.max(...terms);
  if (!(top > -Infinity)) return -Infinity;
  return top + Math.log(terms.reduce((a, t) => a + Math.exp(t - top), 0));
}

/**
 * Φ(x) from erf by M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions (1964),
 * 7.1.26 (|error| ≤ 1.5·10⁻⁷).
 */
export function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * z);
  const erf = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-z * z);
  return x >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
}

/** Log-likelihood of the evidence at each growth (the flat prior adds nothing). */
export function growthLogLikelihood(e: GrowthEvidence, deltaNm: Float64Array): Float64Array {
  const ll = new Float64Array(deltaNm.length);
  if (e.level) {
    const p = e.level.predict(deltaNm);
    const k = e.level.sigmaPerNm ?? 0;
    for (let i = 0; i < ll.length; i++) {
      const sd = Math.hypot(e.level.sigma, k * deltaNm[i]);
      ll[i] -= 0.5 * ((p[i] - e.level.observed) / sd) ** 2 + Math.log(sd / e.level.sigma);
    }
  }
  for (const g of e.gaussians ?? []) {
    for (let i = 0; i < ll.length; i++) ll[i] -= 0.5 * ((deltaNm[i] - g.meanNm) / g.sigmaNm) ** 2;
  }
  return ll;
}

function moments(e: GrowthEvidence, lo: number, hi: number): GrowthEstimate {
  const d = Float64Array.from({ length: GRID }, (_, i) => lo + ((hi - lo) * i) / (GRID - 1));
  const ll = growthLogLikelihood(e, d);
  for (let i = 0; i < GRID; i++) ll[i] += logPrior(e, d[i]);
  let top = -Infinity;
  for (const v of ll) top = Math.max(top, v);
  if (top === -Infinity) return { deltaNm: 0.5 * (lo + hi), sigmaNm: (hi - lo) / Math.sqrt(12) };
  // Trapezoid weights on the uniform grid.
  let w0 = 0, w1 = 0, w2 = 0;
  for (let i = 0; i < GRID; i++) {
    const w = Math.exp(ll[i] - top) * (i === 0 || i === GRID - 1 ? 0.5 : 1);
    w0 += w;
    w1 += w * d[i];
    w2 += w * d[i] * d[i];
  }
  const mean = w1 / w0;
  return { deltaNm: mean, sigmaNm: Math.sqrt(Math.max(0, w2 / w0 - mean * mean)) };
}
