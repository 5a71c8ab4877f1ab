import { describe, expect, it } from 'vitest';
import { stackRT } from '@/tests/chamber/thinFilm';
import { gaussian } from '../../trace/__tests__/rng';
import { layerEnd, settledLevelAfter, startCheck } from '../layerEnd';

// One TiO2-like layer (n = 2.3, k = 0) on glass (1.52, back face incoherent), transmittance at
// 600 nm, built with the chamber simulator's own matrices (tests/chamber/thinFilm.ts), not ours.
const media = { ambient: 1, substrate: 1.52, backside: true };
const T = (d: number) => stackRT([{ n: 2.3, k: 0, thicknessNm: d }], 600, media).T;
const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: 600, mode: 'T' as const };

/** Layer at `rate` for `layerS`, then the shutter closing over `closeS` (rate falling linearly to 0), then idle. */
function trace(rate: number, layerS: number, closeS: number, idleS: number, sigma: number, seed: number) {
  const dt = 0.1, g = gaussian(seed);
  const time: number[] = [], signal: number[] = [];
  let t = 0, d = 0;
  const total = layerS + idleS;
  for (; t <= total + 1e-9; t += dt) {
    const after = t - layerS;
    d = after <= 0 ? rate * t : rate * layerS + (after < closeS ? rate * (after - (after * after) / (2 * closeS)) : (rate * closeS) / 2);
    time.push(t);
    signal.push(T(d) + sigma * g());
  }
  return { timeS: Float64Array.from(time), signal: Float64Array.from(signal), lastIndex: Math.round(layerS / dt) };
}

describe('the end of a layer', () => {
  it('finds the growth while the shutter closes from the settled idle level (level cut on a slope)', () => {
    // 48 nm at 0.5 nm/s (about 0.73 QWOT: the signal still falls steeply), shutter 1 s: 0.25 nm more.
    const errors: number[] = [];
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      const tr = trace(0.5, 96, 1, 20, 0.0005, seed);
      const end = layerEnd({
        signal: tr.signal, timeS: tr.timeS, lastIndex: tr.lastIndex, nextStart: tr.signal.length, optics, below: [], index: 2.3, extinction: 0,
        rateNmPerS: 0.5, rateDriftNmPerS2: 0, durationS: 96, gain: 1, noiseSigma: 0.0005,
      });
      expect(end).not.toBeNull();
      expect(end!.method).toBe('level');
      errors.push((end!.afterCutNm - 0.25) / end!.afterCutSigmaNm);
      expect(Math.abs(end!.afterCutNm - 0.25)).toBeLessThan(0.08);
      expect(end!.extraS).toBeCloseTo(end!.afterCutNm / 0.5, 9);
    }
    // σ is honest: the errors lie within 3σ
    for (const z of errors) expect(Math.abs(z)).toBeLessThan(3);
  });

  it('adds nothing when the shutter closes at once', () => {
    const tr = trace(0.5, 96, 0, 20, 0.0005, 7);
    const end = layerEnd({
      signal: tr.signal, timeS: tr.timeS, lastIndex: tr.lastIndex, nextStart: tr.signal.length, optics, below: [], index: 2.3, extinction: 0,
      rateNmPerS: 0.5, rateDriftNmPerS2: 0, durationS: 96, gain: 1, noiseSigma: 0.0005,
    });
    expect(end!.afterCutNm).toBeLessThan(0.06);
  });

  it('reads the settled level after the closing ramp, and none from a stretch too short', () => {
    const y = Float64Array.from([...Array.from({ length: 8 }, (_, i) => 0.5 - 0.01 * i), ...Array.from({ length: 40 }, () => 0.42)]);
    const s = settledLevelAfter(y, 0, y.length)!;
    expect(s.level).toBeCloseTo(0.42, 6);
    expect(s.startIndex).toBeGreaterThanOrEqual(7);
    expect(settledLevelAfter(y, 0, 6)).toBeNull();
  });

  it('names the layer that does not start where the one below ended', () => {
    const settled = { level: 0.62, sigma: 0.0001, startIndex: 0, samples: 50 };
    expect(startCheck(5, 4, settled, [0.6201, 0.6199, 0.6202, 0.62, 0.6198], 0.0005)).toBeNull();
    expect(startCheck(5, 4, settled, [0.64, 0.641, 0.6405, 0.64, 0.6398], 0.0005)).toMatch(/^layer 5 starts at a reading of 0\.640\d, but the reading settled at 0\.6200 after layer 4/);
  });
});
