import { describe, expect, it } from 'vitest';
import { growthPosterior } from '../growthPosterior';
import { ShutterTime } from '../shutterTime';

describe('the posterior of the growth after a cut', () => {
  it('a Gaussian well inside the bounds comes out as itself', () => {
    const g = growthPosterior({ maxNm: 1, gaussians: [{ meanNm: 0.4, sigmaNm: 0.03 }] });
    expect(g.deltaNm).toBeCloseTo(0.4, 4);
    expect(g.sigmaNm).toBeCloseTo(0.03, 4);
  });

  it('a very narrow Gaussian is still resolved (the grid is refined around it)', () => {
    const g = growthPosterior({ maxNm: 1, gaussians: [{ meanNm: 0.2345, sigmaNm: 0.0002 }] });
    expect(g.deltaNm).toBeCloseTo(0.2345, 5);
    expect(g.sigmaNm / 0.0002).toBeCloseTo(1, 2);
  });

  it('two Gaussians combine by their precisions', () => {
    // Product of normals: mean (μ1/σ1² + μ2/σ2²)/(1/σ1² + 1/σ2²), variance 1/(1/σ1² + 1/σ2²) (textbook identity).
    const g = growthPosterior({ maxNm: 2, gaussians: [{ meanNm: 0.5, sigmaNm: 0.1 }, { meanNm: 0.8, sigmaNm: 0.2 }] });
    const w1 = 1 / 0.01, w2 = 1 / 0.04;
    expect(g.deltaNm).toBeCloseTo((0.5 * w1 + 0.8 * w2) / (w1 + w2), 4);
    expect(g.sigmaNm).toBeCloseTo(Math.sqrt(1 / (w1 + w2)), 4);
  });

  it('a Gaussian centred on 0, cut at 0, gives the half-normal moments', () => {
    // Half-normal: mean σ·√(2/π), σ·√(1 − 2/π) (N. L. Johnson, S. Kotz, N. Balakrishnan,
    // Continuous Univariate Distributions, vol. 1, 2nd ed. (1994), the folded normal; from memory).
    const s = 0.05;
    const g = growthPosterior({ maxNm: 1, gaussians: [{ meanNm: 0, sigmaNm: s }] });
    expect(g.deltaNm).toBeCloseTo(s * Math.sqrt(2 / Math.PI), 4);
    expect(g.sigmaNm).toBeCloseTo(s * Math.sqrt(1 - 2 / Math.PI), 4);
  });

  it('no evidence leaves the flat prior: mean max/2, σ max/√12', () => {
    const g = growthPosterior({ maxNm: 0.6 });
    expect(g.deltaNm).toBeCloseTo(0.3, 6);
    expect(g.sigmaNm).toBeCloseTo(0.6 / Math.sqrt(12), 4);
  });

  it('a level that the curve meets once pins the growth there', () => {
    // Reading 0.5 − 0.1·δ (a slope), observed 0.47 ± 0.001: δ = 0.3 ± 0.01.
    const g = growthPosterior({ maxNm: 1, level: { predict: (d) => Float64Array.from(d, (x) => 0.5 - 0.1 * x), observed: 0.47, sigma: 0.001 } });
    expect(g.deltaNm).toBeCloseTo(0.3, 4);
    expect(g.sigmaNm).toBeCloseTo(0.01, 4);
  });
});

describe("the run's shutter time", () => {
  it('needs three layers, then predicts with the σ of a new observation, s·√(1 + 1/m)', () => {
    const t = new ShutterTime();
    t.add(1, 0.4, 0.01);
    t.add(2, 0.6, 0.01);
    expect(t.predict()).toBeNull();
    t.add(3, 0.5, 0.01);
    const p = t.predict()!;
    // mean 0.5, sample σ 0.1 (m − 1 in the denominator), prediction σ 0.1·√(4/3)
    expect(p.timeS).toBeCloseTo(0.5, 12);
    expect(p.sigmaS).toBeCloseTo(0.1 * Math.sqrt(4 / 3), 12);
    expect(p.from).toBe(3);
    // A layer is never predicted from itself.
    t.add(4, 0.5, 0.01);
    expect(t.predict(4)!.timeS).toBeCloseTo(0.5, 12);
    expect(t.predict(4)!.from).toBe(3);
  });

  it('is never tighter than the layers’ own σ', () => {
    const t = new ShutterTime();
    for (const l of [1, 2, 3, 4]) t.add(l, 0.5, 0.05);
    expect(t.predict()!.sigmaS).toBeCloseTo(0.05 * Math.sqrt(1.25), 12);
    t.remove(4);
    expect(t.count).toBe(3);
  });
});
