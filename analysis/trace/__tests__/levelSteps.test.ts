import { describe, expect, it } from 'vitest';
import { levelSteps } from '../levelSteps';
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
