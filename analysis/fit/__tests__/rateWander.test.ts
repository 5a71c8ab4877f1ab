import { describe, expect, it } from 'vitest';
import {
  endEquivalentLaw, lawRate, lawThickness, lawTimeToThickness, wanderBasis, wanderKnotRates, wanderKnots, wanderRate, wanderThickness,
  type RateWander,
} from '../rateWander';

const wander: RateWander = { knotsS: wanderKnots(100, 10), sigmaNmPerS: 0.01, correlationS: 15, pointSigma: 1 };
const v = Float64Array.from({ length: wander.knotsS.length }, (_, i) => Math.sin(1.3 * i) + 0.2 * i - 1);

describe('rate wander (piecewise-linear Ornstein–Uhlenbeck knots)', () => {
  it('places equally spaced knots from 0 to the end', () => {
    expect(Array.from(wanderKnots(95, 10))).toHaveLength(11);
    expect(wanderKnots(95, 10)[10]).toBe(95);
    expect(wanderKnots(3, 10)).toEqual(Float64Array.of(0, 3));
  });

  it('maps v to knot rates by the exact AR(1) recursion c_k = ρ·c_{k−1} + σ·√(1 − ρ²)·v_k', () => {
    const c = wanderKnotRates(wander, v);
    const rho = Math.exp(-10 / 15);
    expect(c[0]).toBeCloseTo(0.01 * v[0], 15);
    for (let k = 1; k < c.length; k++) expect(c[k]).toBeCloseTo(rho * c[k - 1] + 0.01 * Math.sqrt(1 - rho * rho) * v[k], 15);
  });

  it('gives the stationary variance σ² at every knot (the prior is the OU process sampled at the knots)', () => {
    // Var c_k = σ²·(ρ^(2k) + (1 − ρ²)·Σ_{j<k} ρ^(2j)) = σ² (the OU stationary variance).
    const K = wander.knotsS.length;
    for (let k = 0; k < K; k++) {
      let variance = 0;
      for (let j = 0; j < K; j++) {
        const unit = new Float64Array(K);
        unit[j] = 1;
        variance += wanderKnotRates(wander, unit)[k] ** 2;
      }
      expect(variance).toBeCloseTo(1e-4, 12);
    }
  });

  it('basis Ψ_j(τ) reproduces the integral of the interpolated rate, and ψ_j the rate', () => {
    const b = new Float64Array(v.length), r = new Float64Array(v.length);
    for (const tau of [0, 3.7, 10, 55.5, 100, 130]) {
      wanderBasis(wander, tau, b);
      wanderBasis(wander, tau, r, true);
      expect(b.reduce((s, x, j) => s + x * v[j], 0)).toBeCloseTo(wanderThickness(wander, v, tau), 12);
      expect(r.reduce((s, x, j) => s + x * v[j], 0)).toBeCloseTo(wanderRate(wander, v, tau), 12);
      // the thickness is the rate's integral (Simpson on a fine grid)
      const m = 2000, h = tau / m;
      let integral = 0;
      for (let i = 0; i <= m; i++) integral += (i === 0 || i === m ? 1 : i % 2 ? 4 : 2) * wanderRate(wander, v, i * h);
      expect(wanderThickness(wander, v, tau)).toBeCloseTo((integral * h) / 3, 5);
    }
  });

  it('inverts the law for the time to a thickness, and matches thickness and rate at the end with an equivalent quadratic', () => {
    const law = { rateNmPerS: 0.3, rateDriftNmPerS2: 1e-4, wander: v };
    const tau = lawTimeToThickness(law, wander, 20, 100);
    expect(lawThickness(law, wander, tau)).toBeCloseTo(20, 7);
    const q = endEquivalentLaw(law, wander, 100);
    expect(q.rateNmPerS * 100 + 0.5 * q.rateDriftNmPerS2 * 1e4).toBeCloseTo(lawThickness(law, wander, 100), 10);
    expect(q.rateNmPerS + q.rateDriftNmPerS2 * 100).toBeCloseTo(lawRate(law, wander, 100), 12);
  });
});
