import { chiSquareQuantile } from './distributions';
import { weightedLine } from './weightedLine';

export interface TrendPoint {
  timeS: number;
  value: number;
  /** The value's own 1σ (its measurement error). */
  sigma: number;
}

export interface RandomEffectsTrend {
  /** The line's value at the points' mean time, and its slope per hour. */
  atMean: number;
  slopePerHour: number;
  meanTimeS: number;
  /**
   * The line's 1σ at the mean time and of its slope per hour, and their covariance, with weights
   * 1/(σᵢ² + τ̂²): √[(X'WX)⁻¹], the usual standard errors of a mixed-effects meta-regression
   * (Raudenbush 2009, as above, from memory).
   */
  atMeanSigma: number;
  slopeSigmaPerHour: number;
  atMeanSlopeCovariance: number;
  /** Spread of the true values about the line: the moment estimate and its one-sided upper bound (> 0). */
  tau2: number;
  tau2Upper: number;
  /** Each point's value predicted from the line and its own reading (the BLUP), with its σ. */
  predicted: { value: number; sigma: number }[];
}

/** Fewer points than this leave too few degrees of freedom (k − 2) to tell the spread about a line. */
export const RANDOM_EFFECTS_MIN_POINTS = 5;

/**
 * A linear trend in time under a random-effects (mixed-effects meta-regression) model: each
 * point's true value is a + b·t + uᵢ with uᵢ ~ N(0, τ²), read as yᵢ = that + eᵢ, eᵢ ~ N(0, σᵢ²).
 * τ² by the moment estimator for meta-regression, τ² = max(0, (Q − (k − 2)) / (Σw − tr[(X'WX)⁻¹X'W²X]))
 * with w = 1/σ² (S. W. Raudenbush, in "The Handbook of Research Synthesis and Meta-Analysis",
 * 2nd ed. (2009), ch. 16, from memory; DerSimonian–Laird's estimator without the slope);
 * its upper bound at `upperLevel` by the Q-profile, Q(τ²) = Σ (yᵢ − ŷᵢ(τ²))²/(σᵢ² + τ²) set to
 * the χ²(k − 2) quantile 1 − level (W. Viechtbauer, Stat. Med. 26, 37–52 (2007), from memory),
 * and no less than τ̂² plus `upperLevel`'s normal quantile times the estimate's σ without a
 * spread, √(2(k − 2))/c (Var Q = 2(k − 2) under homogeneity: M. J. Biggerstaff, R. L. Tweedie,
 * Stat. Med. 16, 753–768 (1997), from memory).
 * Each point is then
 * predicted as ŷᵢ + Bᵢ(yᵢ − ŷᵢ), Bᵢ = τ̂²/(τ̂² + σᵢ²) (the best linear unbiased predictor,
 * G. K. Robinson, Statist. Sci. 6, 15–32 (1991)); its error variance Bᵢ²σᵢ² + (1 − Bᵢ)²(v̂ᵢ + τᵤ²)
 * is taken at the upper bound τᵤ² (the estimate's weights kept: a spread the data cannot rule
 * out), v̂ᵢ the line's variance there by the sandwich with weights at τ̂² and variances at τᵤ².
 * null with fewer than RANDOM_EFFECTS_MIN_POINTS points, a σ not > 0, or all at one time.
 */
export function randomEffectsTrend(points: readonly TrendPoint[], upperLevel = 0.95): RandomEffectsTrend | null {
  const k = points.length;
  if (k < RANDOM_EFFECTS_MIN_POINTS || points.some((p) => !(p.sigma > 0) || !Number.isFinite(p.value) || !Number.isFinite(p.timeS))) return null;
  const meanTimeS = points.reduce((a, p) => a + p.timeS, 0) / k;
  const x = points.map((p) => (p.timeS - meanTimeS) / 3600);
  const y = points.map((p) => p.value);
  const s2 = points.map((p) => p.sigma ** 2);
  const at = (tau2: number) => weightedLine(x, y, s2.map((v) => 1 / (v + tau2)));

  const fixed = at(0);
  if (!fixed) return null;
  const w = s2.map((v) => 1 / v);
  // tr[(X'WX)⁻¹ X'W²X] for X = [1, x]
  const [a00, a01, a11] = [sum(w), sum(w.map((wi, i) => wi * x[i])), sum(w.map((wi, i) => wi * x[i] * x[i]))];
  const [b00, b01, b11] = [sum(w.map((wi) => wi * wi)), sum(w.map((wi, i) => wi * wi * x[i])), sum(w.map((wi, i) => wi * wi * x[i] * x[i]))];
  const det = a00 * a11 - a01 * a01;
  const trace = (a11 * b00 - 2 * a01 * b01 + a00 * b11) / det;
  const dof = k - 2;
  const tau2 = Math.max(0, (fixed.q - dof) / (a00 - trace));

  const tau2Upper = qProfileUpperBound((t) => at(t)!.q, dof, tau2, a00 - trace, Math.max(tau2, Math.min(...s2)) || 1e-12, upperLevel);
  const tauU = tau2Upper;

  const line = at(tau2)!;
  // the line's covariance with weights at τ̂² when the values vary by σᵢ² + τᵤ² (sandwich)
  const wt = s2.map((v) => 1 / (v + tau2));
  const m00 = sum(wt.map((wi, i) => wi * wi * (s2[i] + tauU)));
  const m01 = sum(wt.map((wi, i) => wi * wi * (s2[i] + tauU) * x[i]));
  const m11 = sum(wt.map((wi, i) => wi * wi * (s2[i] + tauU) * x[i] * x[i]));
  const [i00, i01, i11] = [line.inv00, line.inv01, line.inv11];
  // C = A⁻¹ M A⁻¹ (symmetric 2×2)
  const c00 = i00 * (i00 * m00 + i01 * m01) + i01 * (i00 * m01 + i01 * m11);
  const c01 = i00 * (i01 * m00 + i11 * m01) + i01 * (i01 * m01 + i11 * m11);
  const c11 = i01 * (i01 * m00 + i11 * m01) + i11 * (i01 * m01 + i11 * m11);
  const predicted = points.map((_, i) => {
    const fit = line.a + line.b * x[i];
    const v = c00 + 2 * c01 * x[i] + c11 * x[i] * x[i];
    const b = tau2 / (tau2 + s2[i]);
    return { value: fit + b * (y[i] - fit), sigma: Math.sqrt(b * b * s2[i] + (1 - b) ** 2 * (v + tauU)) };
  });
  return {
    atMean: line.a, slopePerHour: line.b, meanTimeS,
    atMeanSigma: Math.sqrt(line.inv00), slopeSigmaPerHour: Math.sqrt(line.inv11), atMeanSlopeCovariance: line.inv01,
    tau2, tau2Upper, predicted,
  };
}

const sum = (v: readonly number[]) => v.reduce((a, b) => a + b, 0);

/**
 * The spread's upper bound at `level` by the Q-profile: the τ² at which the profile statistic
 * q(τ²) falls to the χ²(dof) quantile 1 − level (Viechtbauer 2007, from memory), by doubling from
 * `start` and bisection; 0 where q(0) is already below it. Floored at τ̂² plus level's normal
 * quantile times the moment estimate's own σ without a spread, √(2·dof)/c, c its scale (tr P):
 * readings that scatter less than their σ say leave the profile no bound above 0, and that much
 * spread it cannot tell from none at the same level (Q ~ χ²(dof), Var Q = 2·dof).
 */
export function qProfileUpperBound(q: (tau2: number) => number, dof: number, tau2: number, c: number, start: number, level = 0.95): number {
  const target = chiSquareQuantile(1 - level, dof);
  let upper = 0;
  if (q(0) > target) {
    let hi = start;
    while (q(hi) > target && hi < 1e12) hi *= 2;
    let lo = 0;
    for (let i = 0; i < 60; i++) {
      const mid = 0.5 * (lo + hi);
      if (q(mid) > target) lo = mid;
      else hi = mid;
    }
    upper = hi;
  }
  const z = Math.sqrt(chiSquareQuantile(2 * level - 1, 1));
  return Math.max(upper, tau2 + (z * Math.sqrt(2 * dof)) / c);
}
