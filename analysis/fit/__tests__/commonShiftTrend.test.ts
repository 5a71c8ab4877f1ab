import { describe, expect, it } from 'vitest';
import { randomEffectsTrend } from '../../stats';
import { createRng } from '../../synth/prng';
import { commonShiftTrend } from '../commonShiftTrend';

// Without common shifts the model is the random-effects meta-regression of stats/randomEffectsTrend.ts
// (same moment estimator of τ², Raudenbush 2009, from memory): the GLS/BLUP written with full
// matrices must give its τ̂² and predictions (an independent implementation of the same formulas).
const points = [
  { timeS: 0, value: 0.004, sigma: 0.002 }, { timeS: 600, value: -0.001, sigma: 0.001 }, { timeS: 1200, value: 0.006, sigma: 0.003 },
  { timeS: 1800, value: -0.004, sigma: 0.0015 }, { timeS: 2400, value: -0.006, sigma: 0.002 }, { timeS: 3000, value: 0.001, sigma: 0.001 },
  { timeS: 3600, value: -0.009, sigma: 0.0025 },
];

describe('commonShiftTrend', () => {
  it('without shared shifts: the random-effects trend\'s τ̂² and BLUP', () => {
    const a = randomEffectsTrend(points)!;
    const b = commonShiftTrend(points.map((p) => ({ ...p, shifts: [] })))!;
    expect(a.tau2).toBeGreaterThan(0);
    expect(b.tau2).toBeCloseTo(a.tau2, 12);
    b.predicted.forEach((p, i) => expect(p.value).toBeCloseTo(a.predicted[i].value, 10));
  });

  it('a shift shared by every reading is not averaged away: the predictions keep at least its share', () => {
    const delta = 0.002;
    const b = commonShiftTrend(points.map((p) => ({ ...p, shifts: [{ source: points, delta }] })))!;
    // a constant shift moves every reading alike, so the line's level cannot tell it: Var ≥ δ² (it passes whole)
    b.predicted.forEach((p) => expect(p.sigma).toBeGreaterThanOrEqual(delta * 0.999));
  });

  it('readings far less precise than their spread: where τ̂² = 0 the predictions\' 2σ still cover the truth', () => {
    // Monte Carlo on the model itself: true values a + b·t + u, u ~ N(0, τ²), τ = 0.003, read with
    // σ 0.005–0.026 (a 40-layer mirror's H layers logged once a second), 20 readings a run, 2000
    // runs. The moment estimate of τ² is 0 in about a third of them; there Prasad–Rao's expansion
    // put every prediction on the trend with little more than the trend's σ, and 2σ covered 91.4 %
    // of the truths (95.7 % over all runs: right on average, short exactly where the readings
    // cannot tell the spread). At the Q-profile's upper bound there: 99.9 %, 98.7 % over all runs.
    const rng = createRng(20261205);
    const sigmas = Array.from({ length: 20 }, (_, i) => [0.005, 0.0107, 0.026, 0.005][i % 4]);
    let covered = 0, total = 0, runsAtZero = 0, coveredAtZero = 0, totalAtZero = 0;
    for (let run = 0; run < 2000; run++) {
      const truth = sigmas.map((_, i) => 0.003 - 0.000001 * i * 600 + 0.003 * rng.normal());
      const pts = sigmas.map((sigma, i) => ({ timeS: i * 600, value: truth[i] + sigma * rng.normal(), sigma, shifts: [] }));
      const r = commonShiftTrend(pts)!;
      if (r.tau2 === 0) runsAtZero++;
      r.predicted.forEach((p, i) => {
        const hit = Math.abs(p.value - truth[i]) <= 2 * p.sigma ? 1 : 0;
        total++;
        covered += hit;
        if (r.tau2 === 0) {
          totalAtZero++;
          coveredAtZero += hit;
        }
      });
    }
    expect(runsAtZero / 2000).toBeGreaterThan(0.25);
    expect(coveredAtZero / totalAtZero).toBeGreaterThan(0.954);
    expect(covered / total).toBeGreaterThan(0.954);
  });
});
