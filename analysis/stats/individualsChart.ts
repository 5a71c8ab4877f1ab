/** d₂ for moving ranges of two (NIST/SEMATECH e-Handbook §6.3.2.2; Montgomery, Introduction to SQC, appendix table VI). */
export const D2_N2 = 1.128;
/** D₄ for moving ranges of two: the moving-range chart's upper limit factor (same sources). */
export const D4_N2 = 3.267;

export interface IndividualsChart {
  /** X̄ of the baseline points. */
  center: number;
  /** MR̄: mean |xᵢ − xᵢ₋₁| over consecutive baseline points. */
  meanMovingRange: number;
  /** σ̂ = MR̄/d₂. */
  sigma: number;
  /** X̄ ± 3σ̂ = X̄ ± 2.66·MR̄. */
  upper: number;
  lower: number;
  /** D₄·MR̄. */
  movingRangeUpper: number;
  baselineCount: number;
}

/**
 * Limits of an individuals (X) chart from a baseline stretch of the series (phase I): centre
 * X̄, σ̂ = MR̄/d₂ from moving ranges of two, limits X̄ ± 3σ̂ (NIST/SEMATECH e-Handbook of
 * Statistical Methods §6.3.2.2, "Individuals control charts").
 */
export function individualsChart(baseline: ArrayLike<number>): IndividualsChart {
  const n = baseline.length;
  if (n < 2) throw new RangeError(`individualsChart: the baseline needs at least two points (got ${n})`);
  let mean = 0;
  let mr = 0;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(baseline[i])) throw new RangeError(`individualsChart: baseline point ${i} is ${baseline[i]}, not a finite number`);
    mean += (baseline[i] - mean) / (i + 1);
    if (i > 0) mr += (Math.abs(baseline[i] - baseline[i - 1]) - mr) / i;
  }
  const sigma = mr / D2_N2;
  return { center: mean, meanMovingRange: mr, sigma, upper: mean + 3 * sigma, lower: mean - 3 * sigma, movingRangeUpper: D4_N2 * mr, baselineCount: n };
}
