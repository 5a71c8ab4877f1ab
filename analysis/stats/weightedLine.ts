/** A weighted least-squares line of y on [1, x], with (X'WX)⁻¹ and the weighted residual sum Q. */
export interface WeightedLine {
  a: number;
  b: number;
  /** Q = Σ wᵢ(yᵢ − a − b·xᵢ)². */
  q: number;
  inv00: number;
  inv01: number;
  inv11: number;
}

/**
 * Weighted least squares of y on [1, x] (normal equations of the 2 × 2 case: N. R. Draper,
 * H. Smith, Applied Regression Analysis, ch. 9, from memory); null if singular (all x equal).
 */
export function weightedLine(x: readonly number[], y: readonly number[], w: readonly number[]): WeightedLine | null {
  let s0 = 0, s1 = 0, s2 = 0, t0 = 0, t1 = 0;
  for (let i = 0; i < x.length; i++) {
    s0 += w[i];
    s1 += w[i] * x[i];
    s2 += w[i] * x[i] * x[i];
    t0 += w[i] * y[i];
    t1 += w[i] * x[i] * y[i];
  }
  const det = s0 * s2 - s1 * s1;
  if (!(det > 1e-12 * s0 * s2)) return null;
  const a = (s2 * t0 - s1 * t1) / det;
  const b = (s0 * t1 - s1 * t0) / det;
  let q = 0;
  for (let i = 0; i < x.length; i++) q += w[i] * (y[i] - a - b * x[i]) ** 2;
  return { a, b, q, inv00: s2 / det, inv01: -s1 / det, inv11: s0 / det };
}
