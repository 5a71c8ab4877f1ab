import { describe, expect, it } from 'vitest';
import { truncatedNormalMoments } from '../cutPastTurningPoint';

describe('truncatedNormalMoments', () => {
  it('a standard normal cut at 0 is the half-normal: mean √(2/π), variance 1 − 2/π', () => {
    // Half-normal distribution's moments (e.g. N. L. Johnson, S. Kotz & N. Balakrishnan,
    // Continuous Univariate Distributions vol. 1, from memory): 0.79788…, 0.36338…
    const m = truncatedNormalMoments(0, 1, 0, 40);
    expect(m.mean).toBeCloseTo(Math.sqrt(2 / Math.PI), 5);
    expect(m.sigma ** 2).toBeCloseTo(1 - 2 / Math.PI, 5);
  });

  it('shifted and scaled: N(5, 2²) cut at 5 from below', () => {
    const m = truncatedNormalMoments(5, 2, 5, 100);
    expect(m.mean).toBeCloseTo(5 + 2 * Math.sqrt(2 / Math.PI), 4);
    expect(m.sigma).toBeCloseTo(2 * Math.sqrt(1 - 2 / Math.PI), 4);
  });

  it('a reading far wider than the interval leaves the uniform prior: mid-point, width/√12', () => {
    const m = truncatedNormalMoments(0.3, 1e3, 0, 1);
    expect(m.mean).toBeCloseTo(0.5, 4);
    expect(m.sigma).toBeCloseTo(1 / Math.sqrt(12), 4);
  });

  it('a reading far narrower than the interval and inside it stays where it is', () => {
    const m = truncatedNormalMoments(0.5, 0.01, 0, 1);
    expect(m.mean).toBeCloseTo(0.5, 8);
    expect(m.sigma).toBeCloseTo(0.01, 6);
  });

  it('a reading far outside the interval goes to its nearer edge', () => {
    expect(truncatedNormalMoments(-50, 1, 0, 1).mean).toBeCloseTo(0, 6);
    expect(truncatedNormalMoments(60, 1, 0, 1).mean).toBeCloseTo(1, 6);
  });
});
