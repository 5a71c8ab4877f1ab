import { describe, expect, it } from 'vitest';
import { invertSymmetric, leastSquares } from '..';
import { linearTrend } from '../../stats';

describe('leastSquares', () => {
  it('recovers a straight line with the OLS estimates and their standard errors', () => {
    // Anscombe's first data set (F. J. Anscombe, Am. Stat. 27, 17 (1973)): y ≈ 3.00 + 0.500 x
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const fit = leastSquares({ y, model: (p, out) => x.forEach((xi, i) => (out[i] = p[0] + p[1] * xi)), start: [1, 1], scale: [1, 0.1] });
    const ols = linearTrend(x, y);
    expect(fit.converged).toBe(true);
    expect(fit.params[0]).toBeCloseTo(ols.intercept, 6);
    expect(fit.params[1]).toBeCloseTo(ols.slope, 6);
    expect(fit.sigma[1]).toBeCloseTo(ols.slopeSigma, 5);
    expect(fit.sigma[0]).toBeCloseTo(ols.interceptSigma, 5);
    expect(fit.dof).toBe(9);
  });

  it('fits a decaying exponential exactly from noiseless data and flags a parameter the data cannot see', () => {
    const t = Array.from({ length: 50 }, (_, i) => i * 0.1);
    const y = t.map((ti) => 2.5 * Math.exp(-1.3 * ti));
    const fit = leastSquares({ y, model: (p, out) => t.forEach((ti, i) => (out[i] = p[0] * Math.exp(-p[1] * ti))), start: [2, 1], scale: [0.1, 0.1] });
    expect(fit.params[0]).toBeCloseTo(2.5, 8);
    expect(fit.params[1]).toBeCloseTo(1.3, 8);
    const blind = leastSquares({ y, model: (p, out) => t.forEach((ti, i) => (out[i] = p[0] * Math.exp(-p[1] * ti) + 0 * p[2])), start: [2, 1, 0], scale: [0.1, 0.1, 1] });
    expect(blind.wellDetermined).toBe(false);
    expect(Number.isNaN(blind.sigma[2])).toBe(true);
  });

  it("shiftFor: a move of some rows' data shifts a straight line's estimates by that move's own OLS line, on every call", () => {
    // Anscombe's first data set again; the model is linear, so the Gauss–Newton step is exact
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const fit = leastSquares({ y, model: (p, out) => x.forEach((xi, i) => (out[i] = p[0] + p[1] * xi)), start: [1, 1], scale: [1, 0.1] });
    // the moves: all rows, then only rows 3–6 (0 before and after), then only the last row
    const moves = [x.map((xi) => 0.3 - 0.02 * xi), x.map((_, i) => (i >= 3 && i <= 6 ? 0.1 * i - 0.25 : 0)), x.map((_, i) => (i === x.length - 1 ? 1 : 0))];
    for (const dy of moves) {
      const ols = linearTrend(x, dy);
      const shift = fit.shiftFor!(dy)!;
      expect(shift[0]).toBeCloseTo(ols.intercept, 9);
      expect(shift[1]).toBeCloseTo(ols.slope, 9);
    }
  });

  it('rejects impossible problems with exact messages', () => {
    const model = (p: Float64Array, out: Float64Array) => out.fill(p[0]);
    expect(() => leastSquares({ y: [1], model, start: [0, 0], scale: [1, 1] })).toThrow('leastSquares: 1 points cannot determine 2 parameters');
    expect(() => leastSquares({ y: [1, 2], model, start: [0], scale: [1, 1] })).toThrow('leastSquares: scale has 2 entries, start has 1');
  });
});

describe('invertSymmetric', () => {
  it('inverts the 3×3 Hilbert matrix to its known integer inverse', () => {
    // Inverse of the Hilbert matrix: closed form (M.-D. Choi, Am. Math. Monthly 90, 301 (1983)); values from memory.
    const h = [1, 1 / 2, 1 / 3, 1 / 2, 1 / 3, 1 / 4, 1 / 3, 1 / 4, 1 / 5];
    const inv = invertSymmetric(h, 3)!;
    const expected = [9, -36, 30, -36, 192, -180, 30, -180, 180];
    inv.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 8));
  });

  it('returns null for a matrix that is not positive definite', () => {
    expect(invertSymmetric([1, 2, 2, 1], 2)).toBeNull();
    expect(invertSymmetric([1, 1, 1, 1], 2)).toBeNull();
    expect(invertSymmetric([0, 0, 0, 1], 2)).toBeNull();
  });
});
