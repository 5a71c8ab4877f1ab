import { describe, expect, it } from 'vitest';
import { chiSquareQuantile, regularizedGammaP } from '..';

describe('regularized gamma P and the χ² quantile', () => {
  it('closed forms: P(1, x) = 1 − e^(−x), P(2, x) = 1 − (1 + x)e^(−x); χ²(2) quantile −2·ln(1 − p)', () => {
    for (const x of [0.01, 0.7, 1.9, 2.5, 12]) {
      expect(regularizedGammaP(1, x)).toBeCloseTo(1 - Math.exp(-x), 13);
      expect(regularizedGammaP(2, x)).toBeCloseTo(1 - (1 + x) * Math.exp(-x), 13);
    }
    for (const p of [0.05, 0.5, 0.95]) expect(chiSquareQuantile(p, 2)).toBeCloseTo(-2 * Math.log(1 - p), 9);
  });

  it('matches the published table of χ² critical values to its 3 decimals', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.4, critical values of the
    // chi-square distribution (lower tail 0.05 and upper tail 0.05; values from memory).
    expect(chiSquareQuantile(0.05, 3)).toBeCloseTo(0.352, 3);
    expect(chiSquareQuantile(0.05, 10)).toBeCloseTo(3.940, 3);
    expect(chiSquareQuantile(0.05, 18)).toBeCloseTo(9.390, 3);
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841, 3);
    expect(chiSquareQuantile(0.95, 18)).toBeCloseTo(28.869, 3);
  });

  it('rejects arguments outside the domain', () => {
    expect(() => regularizedGammaP(0, 1)).toThrow('regularizedGammaP: a must be > 0 (got 0)');
    expect(() => regularizedGammaP(1, -1)).toThrow('regularizedGammaP: x must be ≥ 0 (got -1)');
    expect(() => chiSquareQuantile(1, 3)).toThrow('chiSquareQuantile: p must be in (0, 1) (got 1)');
    expect(() => chiSquareQuantile(0.5, 0)).toThrow('chiSquareQuantile: dof must be > 0 (got 0)');
  });
});
