import { describe, expect, it } from 'vitest';
import { growthPosterior, normalCdf } from '../growthPosterior';
import { ShutterTime, truncatedLogLikelihood, truncatedPopulation } from '../shutterTime';
import { gaussian } from '../../trace/__tests__/rng';

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

describe('the normal distribution function', () => {
  it('matches the standard normal table', () => {
    // Φ(1) = 0.8413447, Φ(−1.96) = 0.0249979, Φ(3) = 0.9986501 (Abramowitz and Stegun, table 26.1).
    expect(normalCdf(0)).toBeCloseTo(0.5, 7);
    expect(normalCdf(1)).toBeCloseTo(0.8413447, 6);
    expect(normalCdf(-1.96)).toBeCloseTo(0.0249979, 6);
    expect(normalCdf(3)).toBeCloseTo(0.9986501, 6);
  });
});

describe('the growth counted from an estimated thickness', () => {
  it('smears the prior by the estimate\'s σ: box and Gaussian convolved (variances add)', () => {
    // Var of a sum of independent variables adds: box [0, 1] (1/12) plus N(0, 0.2²).
    const g = growthPosterior({ maxNm: 1, smoothNm: 0.2 });
    expect(g.deltaNm).toBeCloseTo(0.5, 3);
    expect(g.sigmaNm).toBeCloseTo(Math.sqrt(1 / 12 + 0.04), 3);
    const h = growthPosterior({ maxNm: 2, prior: { meanNm: 1, sigmaNm: 0.1 }, smoothNm: 0.05 });
    expect(h.deltaNm).toBeCloseTo(1, 4);
    expect(h.sigmaNm).toBeCloseTo(Math.hypot(0.1, 0.05), 4);
  });

  it('lets evidence on the final thickness pull the growth below 0 (the logged thickness was overestimated)', () => {
    // Prior: growth 0 exactly known, logged thickness σ 0.1; the next layer says −0.1 ± 0.1: the posterior
    // is the precision-weighted mean of N(0, 0.1²) and N(−0.1, 0.1²) (box edge at 0 is smeared).
    const g = growthPosterior({ maxNm: 1, prior: { meanNm: 0, sigmaNm: 1e-4 }, smoothNm: 0.1, gaussians: [{ meanNm: -0.1, sigmaNm: 0.1 }] });
    expect(g.deltaNm).toBeLessThan(0);
    expect(g.deltaNm).toBeCloseTo(-0.05, 2);
  });
});

describe('the growth under a Gaussian prior, in closed form', () => {
  // The posterior of x = y + ε, y ~ N(μ, τ²) cut to [0, max], ε ~ N(0, s²), times Gaussian
  // evidence on x, integrated here by brute force (the trapezoid rule on x and on y: its
  // definition, no code shared with growthPosterior's closed form).
  function bruteForce(max: number, prior: { meanNm: number; sigmaNm: number }, smooth: number, evidence: { meanNm: number; sigmaNm: number } | null) {
    const N = 1200, M = 1200;
    const lo = -8 * smooth, hi = max + 8 * smooth;
    let w0 = 0, w1 = 0, w2 = 0;
    for (let i = 0; i <= M; i++) {
      const x = lo + ((hi - lo) * i) / M;
      let px = 0;
      if (smooth > 0) {
        for (let j = 0; j <= N; j++) {
          const y = (max * j) / N;
          px += Math.exp(-0.5 * ((y - prior.meanNm) / prior.sigmaNm) ** 2 - 0.5 * ((x - y) / smooth) ** 2) * (j === 0 || j === N ? 0.5 : 1);
        }
      } else px = x >= 0 && x <= max ? Math.exp(-0.5 * ((x - prior.meanNm) / prior.sigmaNm) ** 2) : 0;
      if (evidence) px *= Math.exp(-0.5 * ((x - evidence.meanNm) / evidence.sigmaNm) ** 2);
      const w = px * (i === 0 || i === M ? 0.5 : 1);
      w0 += w;
      w1 += w * x;
      w2 += w * x * x;
    }
    const mean = w1 / w0;
    return { deltaNm: mean, sigmaNm: Math.sqrt(w2 / w0 - mean * mean) };
  }

  it('agrees with the posterior integrated by brute force, prior inside, across and below the bounds, with and without evidence', () => {
    const cases: [number, { meanNm: number; sigmaNm: number }, number, { meanNm: number; sigmaNm: number } | null][] = [
      [1, { meanNm: 0.4, sigmaNm: 0.2 }, 0.1, null],
      [1, { meanNm: 0.05, sigmaNm: 0.3 }, 0.2, { meanNm: 0.3, sigmaNm: 0.1 }],
      [2, { meanNm: -0.8, sigmaNm: 0.4 }, 0.05, null],
      [2, { meanNm: -0.8, sigmaNm: 0.4 }, 0.3, { meanNm: -0.2, sigmaNm: 0.2 }],
      [0.5, { meanNm: 0.6, sigmaNm: 0.1 }, 0, { meanNm: 0.45, sigmaNm: 0.05 }],
      [0.5, { meanNm: 0.2, sigmaNm: 0.5 }, 0, null],
      [3, { meanNm: 1.2, sigmaNm: 0.05 }, 0.8, { meanNm: 2.5, sigmaNm: 0.6 }],
    ];
    for (const [max, prior, smooth, evidence] of cases) {
      const g = growthPosterior({ maxNm: max, prior, smoothNm: smooth, ...(evidence ? { gaussians: [evidence] } : {}) });
      const b = bruteForce(max, prior, smooth, evidence);
      expect(Math.abs(g.deltaNm - b.deltaNm)).toBeLessThan(2e-5 * max);
      expect(Math.abs(g.sigmaNm - b.sigmaNm)).toBeLessThan(2e-5 * max);
    }
  });
});

describe("the run's shutter time", () => {
  it('needs three other layers, then predicts the mean with the spread and the mean\'s σ', () => {
    const t = new ShutterTime('normal');
    t.add(1, 0.4, 0.01);
    t.add(2, 0.6, 0.01);
    expect(t.predict()).toBeNull();
    t.add(3, 0.5, 0.01);
    const p = t.predict()!;
    // mean 0.5; s² = 0.01 (m − 1 in the denominator); spread² = s² − σ² = 0.0099; prediction variance spread² + s²/3
    expect(p.timeS).toBeCloseTo(0.5, 12);
    expect(p.sigmaS).toBeCloseTo(Math.sqrt(0.0099 + 0.01 / 3), 12);
    expect(p.from).toBe(3);
    // A layer is never predicted from itself.
    t.add(4, 0.9, 0.01);
    expect(t.predict(4)!.timeS).toBeCloseTo(0.5, 12);
    expect(t.predict(4)!.from).toBe(3);
  });

  it('with no spread beyond the layers\' own σ, the prediction is the mean with σ/√m', () => {
    const t = new ShutterTime('normal');
    for (const l of [1, 2, 3, 4]) t.add(l, 0.5, 0.05);
    expect(t.predict()!.sigmaS).toBeCloseTo(0.05 / 2, 12);
    t.remove(4);
    expect(t.count).toBe(3);
  });

  it('weighs each layer by its own σ: loose readings (slow layers) do not pull the prediction', () => {
    // Four layers read the time at ±0.1 s, three (slow, high-index layers) at ±2 s and far off.
    const t = new ShutterTime('normal');
    [0.05, -0.05, 0.1, -0.1].forEach((x, i) => t.add(i + 1, x, 0.1));
    [2.5, 2, -1].forEach((x, i) => t.add(i + 5, x, 2));
    const p = t.predict()!;
    // Q = Σ wᵢ(tᵢ − t̄_w)² ≈ 5.3 is below m − 1 = 6 (each reading lies within its own σ), so τ² = 0
    // and t̄ is the inverse-variance mean, its variance 1/Σw.
    const w = [100, 100, 100, 100, 0.25, 0.25, 0.25];
    const x = [0.05, -0.05, 0.1, -0.1, 2.5, 2, -1];
    const sw = w.reduce((a, b) => a + b, 0);
    expect(p.timeS).toBeCloseTo(w.reduce((a, wi, i) => a + wi * x[i], 0) / sw, 12);
    expect(p.sigmaS).toBeCloseTo(1 / Math.sqrt(sw), 12);
    // the unweighted mean (0.5 s) and its scatter (prediction σ 1.1 s) take the loose ones at face value
    expect(Math.abs(p.timeS)).toBeLessThan(0.02);
    expect(p.sigmaS).toBeLessThan(0.06);
  });

  it('a spread between equally good readings beyond their σ is found (DerSimonian–Laird) and enters the prediction', () => {
    // Two groups of readings, each at σ 0.05, at 0.2 and 0.8: the times themselves scatter.
    const t = new ShutterTime('normal');
    [0.2, 0.8, 0.2, 0.8, 0.2, 0.8].forEach((x, i) => t.add(i + 1, x, 0.05));
    const p = t.predict()!;
    // equal σ: τ² = s² − σ² with s² = 0.09·6/5 = 0.108 (Efron–Morris's moment estimate)
    expect(p.timeS).toBeCloseTo(0.5, 12);
    expect(p.sigmaS).toBeCloseTo(Math.sqrt(0.108 - 0.0025 + 0.108 / 6), 12);
  });

  it('recovers the spread of the times from noisy estimates (the normal hierarchical model)', () => {
    // True times N(0.4, 0.1²), each seen with σ 0.05: τ² = s² − σ² estimates 0.1² (moment estimate; Efron and Morris 1975).
    const g = gaussian(5), t = new ShutterTime('normal');
    for (let l = 1; l <= 400; l++) t.add(l, 0.4 + 0.1 * g() + 0.05 * g(), 0.05);
    const p = t.predict()!;
    expect(p.timeS).toBeCloseTo(0.4, 1);
    expect(Math.sqrt(p.sigmaS ** 2 - 0.0125 / 400)).toBeGreaterThan(0.09);
    expect(Math.sqrt(p.sigmaS ** 2 - 0.0125 / 400)).toBeLessThan(0.11);
  });
});

describe("the run's shutter time as a population cut at 0 (option shutterTimePopulation)", () => {
  // Each layer's growth from its own reading (σ 0.5 s, rate 1 nm/s) under the run's time as the
  // others predict it, as fit/layerEnds.ts reads it: the posterior mean, averaged over the layers.
  const meanReadGrowth = (truth: (l: number) => number, count: number, seed: number, model: 'normal' | 'truncated' | 'mixture' = 'truncated'): number => {
    const g = gaussian(seed), t = new ShutterTime(model);
    const own = new Map<number, number>();
    for (let l = 1; l <= count; l++) {
      own.set(l, truth(l) + 0.5 * g());
      t.add(l, own.get(l)!, 0.5);
    }
    let sum = 0;
    for (let l = 1; l <= count; l++) {
      const p = t.predict(l)!;
      const prior = p.population ? { population: p.population } : { prior: { meanNm: p.timeS, sigmaNm: Math.max(p.sigmaS, 1e-6) } };
      sum += growthPosterior({ maxNm: 2, ...prior, gaussians: [{ meanNm: own.get(l)!, sigmaNm: 0.5 }] }).deltaNm;
    }
    return sum / count;
  };

  it('a shutter that closes at once: the layers read a growth of about 0, not 0.8σ of the prediction above it', () => {
    // over 40 runs of 18 layers (the run's own mean reading scatters ±0.12 s)
    const m = Array.from({ length: 40 }, (_, i) => meanReadGrowth(() => 0, 18, i + 1)).reduce((a, b) => a + b, 0) / 40;
    // 0.06 s here; the uncut normal, cut at 0 afterwards, read 0.14 s ('mixture' below 0.08 s)
    expect(m).toBeLessThan(0.09);
  });

  it('a shutter that always takes the same time: the layers read that time', () => {
    const m = Array.from({ length: 40 }, (_, i) => meanReadGrowth(() => 0.5, 18, i + 1)).reduce((a, b) => a + b, 0) / 40;
    expect(Math.abs(m - 0.5)).toBeLessThan(0.04);
  });

  it("'mixture', the population over its own (μ, τ): a shutter that closes at once still reads about 0, and a fixed time that time", () => {
    const runs = (truth: number, model: 'normal' | 'mixture') => Array.from({ length: 40 }, (_, i) => meanReadGrowth(() => truth, 18, i + 1, model)).reduce((a, b) => a + b, 0) / 40;
    const atOnce = runs(0, 'mixture');
    console.log(`closes at once: mixture ${atOnce.toFixed(3)} s, uncut normal cut afterwards ${runs(0, 'normal').toFixed(3)} s`);
    expect(atOnce).toBeLessThan(0.09);
    expect(Math.abs(runs(0.5, 'mixture') - 0.5)).toBeLessThan(0.04);
  });

  it("'mixture': each component cut at 0 on its own, so a (μ, τ) far below 0 is a pile at 0, not a tail above it", () => {
    const t = new ShutterTime('mixture');
    [0.02, -0.03, 0.01, -0.01, 0.0, 0.02].forEach((x, i) => t.add(i + 1, x, 0.02));
    const p = t.predict()!;
    expect(p.population!.reduce((a, c) => a + c.weight, 0)).toBeCloseTo(1, 9);
    // readings at 0 ± 0.02 s: the population's mean cut at 0 within a few hundredths of a second of 0
    expect(p.timeS).toBeLessThan(0.03);
  });

  it('the marginal likelihood has the normal-with-normal-error form where the cut takes no mass', () => {
    // τ² + σ² with μ far above 0: log N(t̂; μ, τ² + σ²) (the product of two Gaussians integrated over all t).
    const v = [{ timeS: 5.2, sigmaS: 0.3 }, { timeS: 4.7, sigmaS: 0.4 }];
    const mu = 5, tau = 0.2;
    const expected = v.reduce((a, t) => a - 0.5 * (t.timeS - mu) ** 2 / (tau ** 2 + t.sigmaS ** 2) - 0.5 * Math.log(tau ** 2 + t.sigmaS ** 2), 0);
    expect(truncatedLogLikelihood(v, mu, tau)).toBeCloseTo(expected, 9);
    expect(truncatedPopulation(v, 10).meanS).toBeGreaterThan(4.5);
  });
});
