import { describe, expect, it } from 'vitest';
import { groupDifference, groupSummary, outOfToleranceShare, welchAnova, welchT } from '..';

describe('groupSummary', () => {
  it('gives hand-computed mean, sample sd and out-of-tolerance count', () => {
    // Σ = 40, mean 5; Σ(x − 5)² = 9+1+1+1+0+0+4+16 = 32, s = √(32/7) = 2.138090.
    const g = groupSummary([2, 4, 4, 4, 5, 5, 7, 9], [false, false, false, false, false, false, true, true]);
    expect(g.count).toBe(8);
    expect(g.mean).toBeCloseTo(5, 12);
    expect(g.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(g.outOfTolerance).toBe(2);
    expect(outOfToleranceShare(g)).toBe(0.25);
  });

  it('keeps its accuracy on a large offset (Welford)', () => {
    // Deviations −6, −3, +3, +6 from 1e9 + 10: s² = 90/3 = 30 exactly.
    const g = groupSummary([1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16]);
    expect(g.mean).toBe(1e9 + 10);
    expect(g.sd ** 2).toBeCloseTo(30, 9);
  });

  it('is honest about empty and single groups and refuses non-numbers', () => {
    expect(groupSummary([]).mean).toBeNaN();
    expect(groupSummary([3]).sd).toBeNaN();
    expect(outOfToleranceShare(groupSummary([]))).toBeNaN();
    expect(() => groupSummary([1, NaN])).toThrow('groupSummary: value 1 is NaN, not a finite number');
    expect(() => groupSummary([1, 2], [true])).toThrow('groupSummary: 2 values but 1 tolerance flags');
  });
});

describe('groupDifference', () => {
  const g = (count: number, mean: number, variance: number) => ({ count, mean, sd: Math.sqrt(variance), outOfTolerance: 0 });

  it("Welch's t on two hand-worked groups", () => {
    // [1..5]: mean 3, s² 2.5 → s²/n = 0.5. [2,4,…,12]: mean 7, s² 14 → s²/n = 7/3.
    // t = −4/√(17/6) = −2.376354; ν = (17/6)² / (0.5²/4 + (7/3)²/5) = (289/36)/(829/720) = 5780/829 = 6.972256.
    const r = welchT(groupSummary([1, 2, 3, 4, 5]), groupSummary([2, 4, 6, 8, 10, 12]));
    expect(r.test).toBe('welch-t');
    if (r.test === null) return;
    expect(r.statistic).toBeCloseTo(-2.376354, 5);
    expect(r.df2).toBeCloseTo(5780 / 829, 10);
    expect(r.pValue).toBeGreaterThan(0.04);
    expect(r.pValue).toBeLessThan(0.06);
  });

  it("Welch's ANOVA on a hand-worked three-group case", () => {
    // nᵢ = 4, sᵢ² = 4 → wᵢ = 1, W = 3, x̄′ = (1 + 2 + 6)/3 = 3; numerator (4 + 1 + 9)/2 = 7;
    // Λ = 3·(2/3)²/3 = 4/9; denominator 1 + 2·1·(4/9)/8 = 10/9; F = 6.3; ν₂ = 8/(3·4/9) = 6.
    // With ν₁ = 2, P(F > f) = (1 + 2f/ν₂)^(−ν₂/2) = 3.1⁻³ = 0.0335672.
    const r = welchAnova([g(4, 1, 4), g(4, 2, 4), g(4, 6, 4)]);
    expect(r.test).toBe('welch-anova');
    if (r.test === null) return;
    expect(r.statistic).toBeCloseTo(6.3, 10);
    expect(r.df1).toBe(2);
    expect(r.df2).toBeCloseTo(6, 10);
    expect(r.pValue).toBeCloseTo(3.1 ** -3, 8);
  });

  it("reduces to Welch's t for two groups (F = t², same ν)", () => {
    const a = g(7, 10.2, 1.7);
    const b = g(11, 9.1, 0.4);
    const t = welchT(a, b);
    const f = welchAnova([a, b]);
    if (t.test === null || f.test === null) throw new Error('no test');
    expect(f.statistic).toBeCloseTo(t.statistic ** 2, 10);
    expect(f.df2).toBeCloseTo(t.df2, 10);
    expect(f.pValue).toBeCloseTo(t.pValue, 10);
  });

  it('picks the test by the number of usable groups and says when there is none', () => {
    expect(groupDifference([g(5, 1, 1), g(5, 2, 1)]).test).toBe('welch-t');
    expect(groupDifference([g(5, 1, 1), g(5, 2, 1), g(5, 3, 1)]).test).toBe('welch-anova');
    expect(groupDifference([g(5, 1, 1), g(1, 2, NaN), g(5, 3, 1)]).test).toBe('welch-t');
    expect(groupDifference([g(5, 1, 1)])).toEqual({ test: null, groups: 1, reason: 'fewer than two groups with two or more values' });
    expect(groupDifference([g(5, 1, 1), g(3, 1, 0)]).test).toBeNull();
  });

  it('finds no difference far more often than not between groups drawn alike', () => {
    // Three groups of 12 from one uniform generator: p should be spread over (0, 1), mostly above 0.05.
    let seed = 7;
    const next = () => ((seed = (seed * 48271) % 2147483647) / 2147483647);
    let small = 0;
    for (let trial = 0; trial < 200; trial++) {
      const groups = [0, 1, 2].map(() => groupSummary(Array.from({ length: 12 }, next)));
      const r = groupDifference(groups);
      if (r.test !== null && r.pValue < 0.05) small++;
    }
    // About 5 % expected; binomial(200, 0.05) is below 22 with probability > 0.999.
    expect(small).toBeLessThan(22);
  });
});
