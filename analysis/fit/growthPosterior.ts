/** One Gaussian piece of evidence on the growth after a cut, nm. */
export interface GaussianEvidence {
  meanNm: number;
  sigmaNm: number;
}

export interface GrowthEvidence {
  /** Most growth considered, nm (the final rate times the longest shutter time). */
  maxNm: number;
  /** A reading predicted for each growth, against an observed level with its σ (the settled idle level). */
  level?: { predict: (deltaNm: ArrayLike<number>) => Float64Array; observed: number; sigma: number };
  gaussians?: readonly GaussianEvidence[];
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
 * considered) times the level's likelihood (Gaussian in the reading, so not Gaussian in δ where
 * the curve turns) times the Gaussian pieces (the next layer's start, a shutter time from
 * other layers). Mean and σ of the posterior; a second pass refines the grid around it, so a
 * posterior far narrower than the prior is still resolved. Bayes' rule on a grid, e.g.
 * D. S. Sivia, Data Analysis: A Bayesian Tutorial, 2nd ed. (2006), ch. 2 (from memory).
 */
export function growthPosterior(e: GrowthEvidence): GrowthEstimate {
  let lo = 0, hi = Math.max(e.maxNm, 1e-12);
  let out = moments(e, lo, hi);
  for (let pass = 0; pass < 3; pass++) {
    const half = Math.max(8 * out.sigmaNm, (4 * (hi - lo)) / (GRID - 1));
    const nlo = Math.max(0, out.deltaNm - half), nhi = Math.min(e.maxNm, out.deltaNm + half);
    if (!(nhi > nlo) || nhi - nlo > 0.5 * (hi - lo)) break;
    [lo, hi] = [nlo, nhi];
    out = moments(e, lo, hi);
  }
  return out;
}

/** Log-likelihood of the evidence at each growth (the flat prior adds nothing). */
export function growthLogLikelihood(e: GrowthEvidence, deltaNm: Float64Array): Float64Array {
  const ll = new Float64Array(deltaNm.length);
  if (e.level) {
    const p = e.level.predict(deltaNm);
    for (let i = 0; i < ll.length; i++) ll[i] -= 0.5 * ((p[i] - e.level.observed) / e.level.sigma) ** 2;
  }
  for (const g of e.gaussians ?? []) {
    for (let i = 0; i < ll.length; i++) ll[i] -= 0.5 * ((deltaNm[i] - g.meanNm) / g.sigmaNm) ** 2;
  }
  return ll;
}

function moments(e: GrowthEvidence, lo: number, hi: number): GrowthEstimate {
  const d = Float64Array.from({ length: GRID }, (_, i) => lo + ((hi - lo) * i) / (GRID - 1));
  const ll = growthLogLikelihood(e, d);
  let top = -Infinity;
  for (const v of ll) top = Math.max(top, v);
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
