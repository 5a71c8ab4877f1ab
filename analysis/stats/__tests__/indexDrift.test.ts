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

describe('indexDrift: one weighted line per material', () => {
  const at = (hours: number[], dev: number[], sigma: number[]): IndexPoint[] =>
    hours.map((h, i) => ({ layer: i + 1, material: 'H', timeS: h * 3600, indexDeviation: dev[i], indexSigma: sigma[i], indexHeld: false }));

  it('five layers of one σ scattering beyond it: τ̂² = s² − σ², the ordinary line and its σ (closed form, by hand)', () => {
    // With every vᵢ = v, w = 1/v: Q = SSR/v and tr[(X'WX)⁻¹X'W²X] = 2/v, so the meta-regression
    // moment estimator τ̂² = (Q − (k − 2))/(Σw − tr) (S. W. Raudenbush, Handbook of Research
    // Synthesis and Meta-Analysis, 2nd ed. (2009), ch. 16, from memory) is SSR/(k − 2) − v, the
    // weights 1/(v + τ̂²) are equal again and the line is the ordinary one, σ_b² = s²/Sxx.
    // By hand: x = 0, ½, 1, 3⁄2, 2 h, x̄ = 1, Sxx = 2.5; ȳ = 0.001, Sxy = −0.0065, b = −0.0026;
    // residuals 0.4, −1.3, 2.0, −1.7, 0.6 (×10⁻³), SSR = 9.1·10⁻⁶, s² = SSR/3.
    const [d] = indexDrift(at([0, 0.5, 1, 1.5, 2], [0.004, 0.001, 0.003, -0.002, -0.001], [0.001, 0.001, 0.001, 0.001, 0.001]));
    const s2 = 9.1e-6 / 3;
    expect(d.method).toBe('random-effects');
    expect(d.tau2).toBeCloseTo(s2 - 1e-6, 15);
    expect(d.byTime.slope).toBeCloseTo(-0.0026, 14);
    expect(d.byTime.slopeSigma).toBeCloseTo(Math.sqrt(s2 / 2.5), 14);
    expect(d.meanDeviation).toBeCloseTo(0.001, 14);
    expect(d.byTime.intercept).toBeCloseTo(0.0036, 14);
    expect(d.byTime.interceptSigma).toBeCloseTo(Math.sqrt(s2 * (1 / 5 + 1 / 2.5)), 14);
    // one layer per half hour: per layer, half the slope per hour
    expect(d.byOrder.slope).toBeCloseTo(-0.0013, 14);
  });

  it('five layers of unequal σ within their σ of a line: τ̂² = 0, the weighted least-squares line (closed form, by hand)', () => {
    // σ = 1, 2, 1, 2, 1 (×10⁻³): w = 10⁶·(1, ¼, 1, ¼, 1), relative 4, 1, 4, 1, 4 (Σ 14).
    // x = 0…4 h: x̄_w = 28/14 = 2, Σw(x − x̄_w)² = 2.5·10⁵·34; y antisymmetric about 0.001 there,
    // ȳ_w = 0.001, Σw(x − x̄_w)(y − ȳ_w) = 2.5·10⁵·(−0.0344): b = −0.0344/34 per hour, its σ
    // 1/√(2.5·10⁵·34) (weighted least squares: Draper & Smith, Applied Regression Analysis,
    // ch. 9, from memory). Q ≈ 0.02 < k − 2 = 3, so τ̂² = 0. Unweighted the slope is −0.00104.
    const [d] = indexDrift(at([0, 1, 2, 3, 4], [0.003, 0.0022, 0.001, -0.0002, -0.001], [0.001, 0.002, 0.001, 0.002, 0.001]));
    expect(d.method).toBe('random-effects');
    expect(d.tau2).toBe(0);
    expect(d.byTime.slope).toBeCloseTo(-0.0344 / 34, 14);
    expect(d.byTime.slopeSigma).toBeCloseTo(1 / Math.sqrt(2.5e5 * 34), 12);
    // the unweighted mean time (2 h) is the weighted one here
    expect(d.meanDeviation).toBeCloseTo(0.001, 14);
    expect(d.sigma).toEqual([0.001, 0.002, 0.001, 0.002, 0.001]);
  });

  it('three layers: the fixed-effect weighted line, σ widened by √(χ²/(k − 2)) (closed form, by hand)', () => {
    // σ = 1, 2, 1 (×10⁻³), relative weights 4, 1, 4; x = 0, 1, 2 h: x̄_w = 1, ȳ_w = 0.003/9,
    // Σw(x − x̄_w)² = 2.5·10⁵·8, b = −0.008/8 = −0.001; residuals −1, 8, −1 (÷3000), χ² = 2/9 + 16/9 = 2,
    // so σ_b² = (χ²/1)/(2.5·10⁵·8) = 10⁻⁶ (the Birge ratio, common practice).
    const [d] = indexDrift(at([0, 1, 2], [0.001, 0.003, -0.001], [0.001, 0.002, 0.001]));
    expect(d.method).toBe('weighted');
    expect(d.tau2).toBe(0);
    expect(d.byTime.slope).toBeCloseTo(-0.001, 14);
    expect(d.byTime.slopeSigma).toBeCloseTo(0.001, 12);
    expect(d.meanDeviation).toBeCloseTo(1 / 3000, 14);
  });

  it('two layers: a slope without a σ; one layer: its reading; a σ missing: the ordinary line (an older stored reading)', () => {
    const [two] = indexDrift(at([0, 1], [0.001, 0.003], [0.001, 0.002]));
    expect(two.method).toBe('weighted');
    expect(two.byTime.slope).toBeCloseTo(0.002, 14);
    expect(two.byTime.slopeSigma).toBeNaN();
    const [one] = indexDrift(at([1], [0.004], [0.002]));
    expect(one.meanDeviation).toBe(0.004);
    expect(one.byTime.slope).toBeNaN();
    const [none] = indexDrift(at([0, 1, 2], [0.001, 0.003, -0.001], [0.001, NaN, 0.001]));
    expect(none.method).toBe('unweighted');
    // (0.001·(−1) + (−0.001)·1)/2 with x̄ = 1, ȳ = 0.001
    expect(none.byTime.slope).toBeCloseTo(-0.001, 14);
    expect(none.meanDeviation).toBeCloseTo(0.001, 14);
  });
});
