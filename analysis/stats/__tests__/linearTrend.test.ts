import { describe, expect, it } from 'vitest';
import { linearTrend } from '..';

describe('linearTrend', () => {
  it("gives Anscombe's published fit for all four of his data sets", () => {
    // F. J. Anscombe, "Graphs in statistical analysis", Am. Stat. 27, 17–21 (1973): every set has
    // y = 3.00 + 0.500 x; standard error of the slope 0.118 (the latter from memory).
    const x123 = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const sets: [number[], number[]][] = [
      [x123, [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]],
      [x123, [9.14, 8.14, 8.74, 8.77, 9.26, 8.1, 6.13, 3.1, 9.13, 7.26, 4.74]],
      [x123, [7.46, 6.77, 12.74, 7.11, 7.81, 8.84, 6.08, 5.39, 8.15, 6.42, 5.73]],
      [[8, 8, 8, 8, 8, 8, 8, 19, 8, 8, 8], [6.58, 5.76, 7.71, 8.84, 8.47, 7.04, 5.25, 12.5, 5.56, 7.91, 6.89]],
    ];
    for (const [x, y] of sets) {
      const t = linearTrend(x, y);
      expect(t.slope).toBeCloseTo(0.5, 2);
      expect(t.intercept).toBeCloseTo(3.0, 1);
      expect(t.slopeSigma).toBeCloseTo(0.118, 2);
      expect(t.count).toBe(11);
    }
  });

  it('is exact on a straight line and honest about too few points', () => {
    const t = linearTrend([1, 2, 3, 4], [3, 5, 7, 9]);
    expect(t.slope).toBeCloseTo(2, 12);
    expect(t.intercept).toBeCloseTo(1, 12);
    expect(t.slopeSigma).toBeCloseTo(0, 12);
    expect(linearTrend([1, 2], [1, 2]).slopeSigma).toBeNaN();
    expect(linearTrend([5], [1]).slope).toBeNaN();
    expect(linearTrend([], []).count).toBe(0);
    expect(() => linearTrend([1, 2], [1])).toThrow('linearTrend: x has 2 values, y has 1');
  });
});
