import { describe, expect, it } from 'vitest';
import { leastSquares } from '..';
import { combineNormals, driftPriorWeight, gainDriftPrior } from '../gainDriftPrior';

describe('combineNormals', () => {
  it('gives the posterior of a Gaussian mean with known variance (Bishop, PRML (2006), eqs. 2.141–2.142)', () => {
    // Prior μ ~ N(0, 2²); four observations of σ = 1 with mean 3, i.e. a measurement N(3, (1/√4)²).
    // Bishop 2.141: μ_N = σ²/(Nσ₀² + σ²)·μ₀ + Nσ₀²/(Nσ₀² + σ²)·μ_ML = 16/17·3 = 48/17;
    // 2.142: 1/σ_N² = 1/σ₀² + N/σ² = 4.25.
    const p = combineNormals({ mean: 0, sigma: 2 }, { mean: 3, sigma: 0.5 });
    expect(p.mean).toBeCloseTo(48 / 17, 12);
    expect(p.sigma).toBeCloseTo(1 / Math.sqrt(4.25), 12);
  });

  it('leaves the prior as it is without a measurement, or with one of no precision', () => {
    expect(combineNormals({ mean: 0.2, sigma: 0.1 }, null)).toEqual({ mean: 0.2, sigma: 0.1 });
    expect(combineNormals({ mean: 0.2, sigma: 0.1 }, { mean: 5, sigma: Infinity })).toEqual({ mean: 0.2, sigma: 0.1 });
  });

  it('takes the lamp stability per hour as the drift prior per second, updated by the drift across chips', () => {
    const alone = gainDriftPrior(0.01, null);
    expect(alone.meanPerS).toBe(0);
    expect(alone.sigmaPerS).toBeCloseTo(0.01 / 3600, 15);
    // Equal precisions: the mean halfway, σ/√2.
    const both = gainDriftPrior(0.01, { driftPerS: -0.01 / 3600, sigmaPerS: 0.01 / 3600 });
    expect(both.meanPerS).toBeCloseTo(-0.005 / 3600, 15);
    expect(both.sigmaPerS).toBeCloseTo(0.01 / 3600 / Math.SQRT2, 15);
  });
});

describe('a Gaussian prior as a pseudo-observation row (driftPriorWeight)', () => {
  it('gives the Bayesian linear-regression posterior mean and covariance (Bishop, PRML (2006), §3.3, eqs. 3.53–3.54)', () => {
    // Anscombe's first data set (F. J. Anscombe, Am. Stat. 27, 17 (1973)); y = a + b·x with a flat
    // prior on a and b ~ N(m₀, σ₀²), noise σ known. Closed form: S_N⁻¹ = S₀⁻¹ + βΦᵀΦ,
    // m_N = S_N·(S₀⁻¹m₀ + βΦᵀt), β = 1/σ², S₀⁻¹ = diag(0, 1/σ₀²) (the flat prior's limit).
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const t = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const sigma = 1.2, m0 = 0.3, s0 = 0.05;
    const beta = 1 / sigma ** 2;
    let n = 0, sx = 0, sxx = 0, st = 0, sxt = 0;
    x.forEach((xi, i) => { n++; sx += xi; sxx += xi * xi; st += t[i]; sxt += xi * t[i]; });
    // S_N⁻¹ (2×2) and its inverse by hand
    const A = [beta * n, beta * sx, beta * sx, beta * sxx + 1 / s0 ** 2];
    const det = A[0] * A[3] - A[1] * A[2];
    const SN = [A[3] / det, -A[1] / det, -A[2] / det, A[0] / det];
    const rhs = [beta * st, beta * sxt + m0 / s0 ** 2];
    const mN = [SN[0] * rhs[0] + SN[1] * rhs[1], SN[2] * rhs[0] + SN[3] * rhs[1]];

    const c = driftPriorWeight({ sigmaPerS: s0 }, sigma, 1);
    const y = [...t, c * m0];
    const fit = leastSquares({
      y, start: [1, 1], scale: [1, 0.1],
      model: (p, out) => { x.forEach((xi, i) => (out[i] = p[0] + p[1] * xi)); out[x.length] = c * p[1]; },
    });
    expect(fit.params[0]).toBeCloseTo(mN[0], 6);
    expect(fit.params[1]).toBeCloseTo(mN[1], 6);
    // The solver scales its covariance by its own s² = SSR/dof; with σ in its place it is S_N.
    const k = sigma ** 2 / (fit.ssr / fit.dof);
    expect(fit.covariance[0] * k).toBeCloseTo(SN[0], 6);
    expect(fit.covariance[1] * k).toBeCloseTo(SN[1], 6);
    expect(fit.covariance[3] * k).toBeCloseTo(SN[3], 8);
    // The prior pulls the slope from its least-squares value 0.500 toward 0.3.
    expect(mN[1]).toBeLessThan(0.45);
    expect(mN[1]).toBeGreaterThan(0.3);
  });

  it('holds the prior precision under the correlated-noise scaling of the covariance (c = √τ·s/σ₀)', () => {
    // cov = τ·s²·(JᵀJ + c²)⁻¹ on one parameter with JᵀJ = 0: τ·s²/c² must be σ₀².
    const c = driftPriorWeight({ sigmaPerS: 2e-6 }, 3e-4, 4);
    expect((4 * (3e-4) ** 2) / c ** 2).toBeCloseTo((2e-6) ** 2, 20);
    // τ below one (anticorrelated residuals) is not allowed to strengthen the prior.
    expect(driftPriorWeight({ sigmaPerS: 2e-6 }, 3e-4, 0.5)).toBe(driftPriorWeight({ sigmaPerS: 2e-6 }, 3e-4, 1));
  });
});
