import { describe, expect, it } from 'vitest';
import { levelSteps, meanSigma } from '../levelSteps';
import { gaussian } from './rng';

/** Levels [value, samples] in sequence with white noise σ, or AR(1) noise of correlation ρ. */
function staircase(parts: [number, number][], sigma: number, seed: number, rho = 0): Float64Array {
  const g = gaussian(seed);
  const out: number[] = [];
  let e = 0;
  for (const [v, count] of parts) {
    for (let i = 0; i < count; i++) {
      e = rho * e + Math.sqrt(1 - rho * rho) * g();
      out.push(v + sigma * e);
    }
  }
  return Float64Array.from(out);
}

describe('levelSteps (binary segmentation of a piecewise-constant series)', () => {
  it('finds the old chip level, a dark transient and the bare new chip, with their boundaries', () => {
    const y = staircase([[0.012, 300], [0.0002, 80], [0.0415, 400]], 0.0005, 1);
    const levels = levelSteps(y);
    expect(levels.map((l) => [l.start, l.end])).toEqual([[0, 300], [300, 380], [380, 780]]);
    expect(levels[2].mean).toBeCloseTo(0.0415, 4);
    expect(levels[1].mean).toBeCloseTo(0.0002, 3);
  });

  it('finds no step in pure noise, white or correlated over ~5 samples', () => {
    for (const seed of [2, 3, 4, 5]) {
      expect(levelSteps(staircase([[0.9, 2000]], 0.0006, seed))).toHaveLength(1);
      expect(levelSteps(staircase([[0.9, 2000]], 0.0006, seed, 0.8)).length).toBeLessThanOrEqual(2);
    }
  });

  it('sees a step of 6σ but not one of 1σ over 200 samples each side', () => {
    expect(levelSteps(staircase([[0.5, 200], [0.5 + 6 * 0.001, 200]], 0.001, 6))).toHaveLength(2);
    expect(levelSteps(staircase([[0.5, 200], [0.5 + 0.15 * 0.001, 200]], 0.001, 7))).toHaveLength(1);
  });

  it('merges adjacent levels closer than mergeBelow, and handles tiny inputs', () => {
    const y = staircase([[1, 100], [1.01, 100], [2, 100]], 0.001, 8);
    expect(levelSteps(y)).toHaveLength(3);
    const merged = levelSteps(y, { mergeBelow: 0.05 });
    expect(merged.map((l) => [l.start, l.end])).toEqual([[0, 200], [200, 300]]);
    expect(merged[0].mean).toBeCloseTo(1.005, 3);
    expect(levelSteps([])).toEqual([]);
    expect(levelSteps([3, 3, 3])).toEqual([{ start: 0, end: 3, mean: 3 }]);
  });
});

describe('meanSigma (σ of a mean of m consecutive samples)', () => {
  // The check: block means of simulated series, their spread measured directly (no formula of
  // the code involved), against the code's estimate from one stretch of the same noise.
  function blockMeanSpread(y: Float64Array, m: number): number {
    const means: number[] = [];
    for (let i = 0; i + m <= y.length; i += m) {
      let s = 0;
      for (let k = i; k < i + m; k++) s += y[k];
      means.push(s / m);
    }
    const mu = means.reduce((a, b) => a + b, 0) / means.length;
    return Math.sqrt(means.reduce((a, b) => a + (b - mu) ** 2, 0) / (means.length - 1));
  }

  it('is σ/√m for white noise', () => {
    const y = staircase([[0.5, 4000]], 0.001, 21);
    for (const m of [5, 50]) expect(meanSigma(y, m) / (0.001 / Math.sqrt(m))).toBeCloseTo(1, 1);
  });

  it('follows the measured spread of block means for AR(1) noise, from short dips to long stretches', () => {
    // ρ = e^(−0.1): a 1 s correlation sampled at 10 Hz, as a lock-in gives.
    const rho = Math.exp(-0.1);
    const long = staircase([[0.5, 200_000]], 0.0006, 22, rho);
    // A stretch of 400 correlation times; one of 20 (a 20 s bare chip) gives σ within a factor of
    // about 3 either way (the long-run variance of a short stretch is itself that uncertain).
    for (const from of [0, 50_000, 100_000]) {
      const stretch = long.subarray(from, from + 4000);
      for (const m of [5, 20, 200]) {
        const ratio = meanSigma(stretch, m) / blockMeanSpread(long, m);
        expect(ratio).toBeGreaterThan(0.75);
        expect(ratio).toBeLessThan(1.33);
      }
    }
    const stretch = long.subarray(0, 4000);
    // A short dip averages almost nothing away: σ of a 5-sample mean stays near the noise's σ.
    expect(meanSigma(stretch, 5)).toBeGreaterThan(0.8 * 0.0006);
  });
});
