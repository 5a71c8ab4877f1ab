import { describe, expect, it } from 'vitest';
import { randomEffectsTrend } from '../../stats';
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
});
