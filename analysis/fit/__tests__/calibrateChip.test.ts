import { describe, expect, it } from 'vitest';
import { calibrateChip } from '../calibrateChip';
import { gaussian } from '../../trace/__tests__/rng';

function idle(parts: [number, number][], sigma: number, seed: number): Float64Array {
  const g = gaussian(seed);
  return Float64Array.from(parts.flatMap(([v, n]) => Array.from({ length: n }, () => v + sigma * g())));
}

// Bare crown glass in reflectance, both faces: R ≈ 2·0.0426/(1 + 0.0426) ≈ 0.0817 (Fresnel, normal
// incidence, incoherent back face; textbook formula). The gain and offset are invented.
const M0 = 0.0817, GAIN = 1.25, OFFSET = 0.004;
const bare = GAIN * M0 + OFFSET;

describe('calibrateChip reads the idle stretch as levels', () => {
  it('leaves out the old chip\'s low level, takes the dark transient as the offset and the bare new chip as the gain', () => {
    // old AR chip at 0.3 % R, then 3 s dark, then the new chip (10 samples/s)
    const y = idle([[GAIN * 0.003 + OFFSET, 50], [OFFSET, 30], [bare, 120]], 0.0004, 11);
    const c = calibrateChip({ chip: 2, idleSignal: y, firstLayerSignal: [], modelledBare: M0, knownOffset: OFFSET, previousChipLevel: GAIN * 0.003 + OFFSET });
    expect(c.source).toBe('bare-chip');
    expect(c.offsetSource).toBe('dark');
    expect(c.darkSamples).toBe(30);
    expect(c.bareSamples).toBe(120);
    expect(c.otherSamples).toBe(50);
    expect(c.offset).toBeCloseTo(OFFSET, 3);
    expect(Math.abs(c.gain / GAIN - 1)).toBeLessThan(0.01);
    expect(c.offsetSigma).toBeGreaterThan(0);
  });

  it('a dark moment of 5 samples with sloping sides (the holder turning, 10 Hz): the offset from its flat bottom, not a side\'s sample', () => {
    // In transmittance: the old mirror chip at 0.306, down over 3 samples, 5 at the stray light
    // only, up over 3 to the bare chip at 0.932 (the chamber simulator's chip change, seed 28, chip 2).
    const T_OLD = 0.306, T_BARE = 0.932, STRAY = 0.003;
    const y = idle([[T_OLD, 52], [0.205, 1], [0.104, 1], [STRAY, 5], [0.313, 1], [0.623, 1], [T_BARE, 200]], 0.0003, 15);
    const c = calibrateChip({ chip: 2, idleSignal: y, firstLayerSignal: [], modelledBare: 0.932, knownOffset: STRAY, previousChipLevel: T_OLD });
    expect(c.offsetSource).toBe('dark');
    expect(Math.abs(c.offset - STRAY)).toBeLessThan(0.001);
    expect(c.darkSamples).toBeGreaterThanOrEqual(2);
    expect(c.darkSamples).toBeLessThanOrEqual(5);
  });

  it('without a dark transient, does not take the old chip\'s low level for dark (it is next to the expected previous-chip reading)', () => {
    const old = GAIN * 0.006 + OFFSET;
    const y = idle([[old, 80], [bare, 120]], 0.0003, 12);
    const c = calibrateChip({ chip: 2, idleSignal: y, firstLayerSignal: [], modelledBare: M0, knownOffset: OFFSET, previousChipLevel: GAIN * 0.0055 + OFFSET });
    expect(c.offsetSource).toBe('earlier-chip');
    expect(c.offset).toBe(OFFSET);
    expect(c.darkSamples).toBe(0);
    expect(Math.abs(c.gain / GAIN - 1)).toBeLessThan(0.01);
  });

  it('the old code\'s failure: averaging every idle sample below 30 % of the upper level would misread the offset', () => {
    const y = idle([[GAIN * 0.003 + OFFSET, 300], [OFFSET, 20], [bare, 100]], 0.0003, 13);
    const c = calibrateChip({ chip: 3, idleSignal: y, firstLayerSignal: [], modelledBare: M0, knownOffset: OFFSET, previousChipLevel: GAIN * 0.003 + OFFSET });
    expect(c.offset).toBeCloseTo(OFFSET, 3);
    expect(c.darkSamples).toBe(20);
  });

  it('takes the last level when the layer\'s growth after the cut and the old chip come first, and falls back to the first layer with no idle stretch', () => {
    const ramp: [number, number][] = Array.from({ length: 10 }, (_, i) => [0.5 + 0.01 * i, 2]);
    const y = idle([...ramp, [0.6, 100], [OFFSET, 25], [bare, 60]], 0.0003, 14);
    const c = calibrateChip({ chip: 2, idleSignal: y, firstLayerSignal: [], modelledBare: M0 });
    expect(c.bareSamples).toBe(60);
    expect(c.offset).toBeCloseTo(OFFSET, 3);
    const f = calibrateChip({ chip: 1, idleSignal: [], firstLayerSignal: [bare, bare, bare], modelledBare: M0 });
    expect(f.source).toBe('first-layer');
    expect(f.offsetSource).toBe('assumed');
    expect(() => calibrateChip({ chip: 4, idleSignal: [], firstLayerSignal: [], modelledBare: M0 })).toThrow(/chip 4: no samples/);
  });
});
