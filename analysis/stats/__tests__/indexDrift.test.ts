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
    expect(h.byOrder.slope).toBeCloseTo(-0.01, 12);
    expect(h.byTime.slope).toBeCloseTo(-0.03, 10); // per hour
    expect(h.meanDeviation).toBeCloseTo(0, 12);
    expect(l.byOrder.slope).toBeCloseTo(0, 12);
    expect(l.meanDeviation).toBeCloseTo(-0.002, 12);
  });

  it("estimates a material's deviation at a time from this run's fitted layers", () => {
    expect(driftEstimateAt([], 'H', 0)).toBeNull();
    // Two layers: their mean; σ of a new layer's index from their spread s² = 5·10⁻⁵ as s·√(1 + 1/n).
    expect(driftEstimateAt([point(1, 'H', 0, 0.01), point(2, 'H', 100, 0.02)], 'H', 500)).toEqual({ deviation: 0.015, sigma: Math.sqrt(5e-5 * 1.5), from: 2 });
    const e = driftEstimateAt([point(1, 'H', 0, 0), point(2, 'H', 3600, -0.01), point(3, 'H', 7200, -0.02)], 'H', 10800)!;
    expect(e.deviation).toBeCloseTo(-0.03, 10);
    expect(e.from).toBe(3);
    // On an exact line the scatter floor (0.005) stands in for s; the prediction of a new
    // observation three hours on: s²·(1 + 1/3 + (3 − 1)²/2) (Draper & Smith, ch. 1).
    expect(e.sigma).toBeCloseTo(0.005 * Math.sqrt(1 + 1 / 3 + 2), 10);
  });
});
