import { describe, expect, it } from 'vitest';
import { driftEstimateAt, indexDrift, type IndexPoint } from '..';

const point = (layer: number, material: string, timeS: number, indexDeviation: number, indexHeld = false): IndexPoint => ({
  layer, material, timeS, indexDeviation, indexSigma: 0.001, indexHeld,
});

describe('indexDrift', () => {
  it('fits deviation against layer order and against time, per material, leaving held layers out', () => {
    const pts = [
      point(1, 'H', 0, 0.01), point(2, 'L', 600, -0.002), point(3, 'H', 1200, 0.0), point(4, 'L', 1800, -0.002),
      point(5, 'H', 2400, -0.01), point(6, 'H', 3000, 0.5, true),
    ];
    const [h, l] = indexDrift(pts);
    expect(h.material).toBe('H');
    expect(h.layers).toEqual([1, 3, 5]);
    expect(h.sigma).toEqual([0.001, 0.001, 0.001]);
    expect(h.byOrder.slope).toBeCloseTo(-0.01, 12);
    expect(h.byTime.slope).toBeCloseTo(-0.03, 10); // per hour
    expect(h.meanDeviation).toBeCloseTo(0, 12);
    expect(l.byOrder.slope).toBeCloseTo(0, 12);
    expect(l.meanDeviation).toBeCloseTo(-0.002, 12);
  });

  it("estimates a material's deviation at a time from this run's fitted layers", () => {
    expect(driftEstimateAt([], 'H', 0)).toBeNull();
    // Weighted least squares (Draper & Smith, Applied Regression Analysis, ch. 9, from memory):
    // wᵢ = 1/(σᵢ² + s₀²), σᵢ = 0.001, s₀ = 0.005, so w = 1/2.6·10⁻⁵ for every layer here.
    const v = 0.001 ** 2 + 0.005 ** 2;
    // Two layers: their mean; χ²/ν = (2·0.005²/v)/1 > 1 scales 1/Σw + s₀².
    const two = driftEstimateAt([point(1, 'H', 0, 0.01), point(2, 'H', 100, 0.02)], 'H', 500)!;
    expect(two.deviation).toBeCloseTo(0.015, 12);
    expect(two.from).toBe(2);
    expect(two.sigma).toBeCloseTo(Math.sqrt(((2 * 0.005 ** 2) / v) * (v / 2 + 0.005 ** 2)), 12);
    const e = driftEstimateAt([point(1, 'H', 0, 0), point(2, 'H', 3600, -0.01), point(3, 'H', 7200, -0.02)], 'H', 10800)!;
    expect(e.deviation).toBeCloseTo(-0.03, 10);
    expect(e.from).toBe(3);
    // On an exact line χ² = 0: the prediction of a new observation three hours on,
    // 1/Σw + (3 − 1)²/Sxx + s₀² with Σw = 3/v and Sxx = 2/v (Draper & Smith, ch. 1, weighted).
    expect(e.sigma).toBeCloseTo(Math.sqrt(v / 3 + (4 * v) / 2 + 0.005 ** 2), 10);
  });

  it('weighs each layer by its own σ: a poorly determined index barely moves the estimate', () => {
    const precise = { ...point(1, 'H', 0, -0.002), indexSigma: 0.002 };
    const poor = { ...point(2, 'H', 600, 0.023), indexSigma: 0.0175 };
    const e = driftEstimateAt([precise, poor], 'H', 1200)!;
    const w1 = 1 / (0.002 ** 2 + 0.005 ** 2), w2 = 1 / (0.0175 ** 2 + 0.005 ** 2);
    expect(e.deviation).toBeCloseTo((w1 * -0.002 + w2 * 0.023) / (w1 + w2), 12);
    // Unweighted, the mean would be 0.0105; weighted it stays near the precise layer.
    expect(Math.abs(e.deviation)).toBeLessThan(0.001);
    // One layer alone: its value, σ² = its own σ² + s₀² (a new layer scatters about it by s₀).
    const one = driftEstimateAt([precise], 'H', 0)!;
    expect(one.deviation).toBe(-0.002);
    expect(one.sigma).toBeCloseTo(Math.sqrt(0.002 ** 2 + 2 * 0.005 ** 2), 12);
  });
});
