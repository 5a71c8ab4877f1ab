// The Cramér–Rao bound for a signal in Gaussian white + AR(1) noise, written for the test tree
// alone: it shares nothing with analysis/ (no fitting, no statistics code from there).
//
// For y = s(θ) + w, w ~ N(0, Σ), the Fisher information is F = Jᵀ Σ⁻¹ J with J = ∂s/∂θ and
// every unbiased estimator has Cov(θ̂) ⪰ F⁻¹ (S. M. Kay, "Fundamentals of Statistical Signal
// Processing: Estimation Theory", Prentice Hall 1993, §3.9, eq. 3.31; from memory).

/** White + AR(1) noise: Σ = σ_w²·I + σ_x²·ρ^|i−j| (the chamber simulator's detector noise). */
export interface Ar1WhiteNoise {
  whiteSigma: number;
  ar1Sigma: number;
  /** Lag-one correlation of the AR(1) part, e^(−Δt/τ). */
  rho: number;
}

/**
 * L⁻¹·X for Σ = L·Lᵀ, column by column (X is `columns` arrays of equal length): the standardised
 * Kalman innovations of the state-space form x_i = ρ·x_{i−1} + q_i, y_i = x_i + v_i, started at
 * the stationary variance. The filter's gains do not depend on the data, so it is one linear map,
 * and the innovations are white with unit variance: this is the Cholesky factor's inverse without
 * forming Σ (R. E. Kalman 1960; the innovations form of the likelihood, e.g. Harvey 1989; from memory).
 */
export function whiten(columns: readonly Float64Array[], noise: Ar1WhiteNoise): Float64Array[] {
  const { whiteSigma, ar1Sigma, rho } = noise;
  const r = whiteSigma * whiteSigma, stat = ar1Sigma * ar1Sigma, q = stat * (1 - rho * rho);
  const n = columns.length ? columns[0].length : 0;
  const out = columns.map(() => new Float64Array(n));
  const state = new Float64Array(columns.length);
  let p = stat;
  for (let i = 0; i < n; i++) {
    const s = p + r;
    if (!(s > 0)) throw new RangeError('cramerRao: zero noise variance');
    const k = p / s, root = Math.sqrt(s);
    for (let c = 0; c < columns.length; c++) {
      const e = columns[c][i] - state[c];
      out[c][i] = e / root;
      state[c] = rho * (state[c] + k * e);
    }
    p = rho * rho * (1 - k) * p + q;
  }
  return out;
}

/** F = Jᵀ Σ⁻¹ J from the Jacobian's columns (one per parameter). */
export function fisherInformation(jacobianColumns: readonly Float64Array[], noise: Ar1WhiteNoise): number[][] {
  const w = whiten(jacobianColumns, noise);
  return w.map((a) => w.map((b) => a.reduce((sum, v, i) => sum + v * b[i], 0)));
}

/** Inverse of a small symmetric positive-definite matrix (Gauss–Jordan with partial pivoting). */
export function invert(m: readonly number[][]): number[][] {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r][col]) > Math.abs(a[piv][col])) piv = r;
    if (!(Math.abs(a[piv][col]) > 0)) throw new RangeError('cramerRao: singular information matrix');
    [a[col], a[piv]] = [a[piv], a[col]];
    const d = a[col][col];
    for (let j = 0; j < 2 * n; j++) a[col][j] /= d;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r][col];
      if (f !== 0) for (let j = 0; j < 2 * n; j++) a[r][j] -= f * a[col][j];
    }
  }
  return a.map((row) => row.slice(n));
}

/** gᵀ·C·g: the variance of a function of θ to first order (the delta method). */
export function quadratic(c: readonly number[][], g: readonly number[]): number {
  return c.reduce((sum, row, i) => sum + g[i] * row.reduce((s, v, j) => s + v * g[j], 0), 0);
}

/** Standard normal CDF; erf by Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7). */
export function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * z);
  const erf = 1 - t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429)))) * Math.exp(-z * z);
  return x >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
}

/**
 * The distribution of max_i |e_i| for independent e_i ~ N(0, σ_i²): P(max ≤ x) = Π (2Φ(x/σ_i) − 1);
 * its mean ∫₀^∞ (1 − P(max ≤ x)) dx by the trapezoid rule, and the probability that all lie within x.
 */
export function maxAbsNormal(sigmas: readonly number[]): { mean: number; within: (x: number) => number; quantile: (p: number) => number } {
  const within = (x: number) => sigmas.reduce((prod, s) => prod * (2 * normalCdf(x / s) - 1), 1);
  const top = 10 * Math.max(...sigmas), steps = 20000, h = top / steps;
  let mean = 0;
  for (let i = 0; i <= steps; i++) mean += (i === 0 || i === steps ? 0.5 : 1) * (1 - within(i * h)) * h;
  const quantile = (p: number) => {
    let lo = 0, hi = top;
    for (let k = 0; k < 60; k++) {
      const mid = (lo + hi) / 2;
      if (within(mid) < p) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  };
  return { mean, within, quantile };
}
