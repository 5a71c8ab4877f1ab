import { describe, expect, it } from 'vitest';
import { findTurningPoints } from '../turningPoints';
import { gaussian } from './rng';

function sinusoid(periodS: number, phase: number, noise: number, seed: number, durationS = 300, dtS = 0.1) {
  const n = Math.round(durationS / dtS) + 1;
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const g = gaussian(seed);
  for (let i = 0; i < n; i++) {
    t[i] = i * dtS;
    y[i] = 0.6 + 0.2 * Math.cos((2 * Math.PI * t[i]) / periodS + phase) + noise * g();
  }
  // maxima where the phase is 2πk, minima where it is (2k+1)π
  const truth: { timeS: number; kind: 'max' | 'min' }[] = [];
  for (let k = -1; k < 2 * (durationS / periodS) + 2; k++) {
    const ts = ((k * Math.PI - phase) * periodS) / (2 * Math.PI);
    if (ts > 0 && ts < durationS) truth.push({ timeS: ts, kind: k % 2 === 0 ? 'max' : 'min' });
  }
  return { t, y, truth };
}

describe('findTurningPoints', () => {
  it('recovers the extrema of a sinusoid with 0.1 % noise to within 0.5 % of a period', () => {
    for (const [seed, periodS, phase] of [[1, 60, 0.3], [2, 47, 2.0], [3, 120, -1.1]] as const) {
      const { t, y, truth } = sinusoid(periodS, phase, 0.0006, seed);
      const tp = findTurningPoints(t, y);
      // extrema closer to the ends than the refinement needs may be missed: only interior ones must match
      const interior = truth.filter((p) => p.timeS > 0.1 * periodS && p.timeS < 300 - 0.1 * periodS);
      for (const p of interior) {
        const match = tp.find((q) => Math.abs(q.timeS - p.timeS) < 0.1 * periodS);
        expect(match, `extremum at ${p.timeS}`).toBeDefined();
        expect(match!.kind).toBe(p.kind);
        expect(Math.abs(match!.timeS - p.timeS)).toBeLessThan(0.005 * periodS);
        expect(Math.abs(match!.value - (p.kind === 'max' ? 0.8 : 0.4))).toBeLessThan(0.002);
      }
      expect(tp.length).toBeLessThanOrEqual(truth.length);
      for (let i = 1; i < tp.length; i++) expect(tp[i].kind).not.toBe(tp[i - 1].kind);
    }
  });

  it('works on a smoothed copy too', () => {
    const { t, y, truth } = sinusoid(60, 0.3, 0.0006, 9);
    const tp = findTurningPoints(t, y, { smoothWindow: 21 });
    const inner = truth.filter((p) => p.timeS > 6 && p.timeS < 294);
    for (const p of inner) expect(Math.min(...tp.map((q) => Math.abs(q.timeS - p.timeS)))).toBeLessThan(0.3);
  });

  it('finds nothing in pure noise (10^5 samples)', () => {
    const g = gaussian(7);
    const n = 100_000;
    const t = Float64Array.from({ length: n }, (_, i) => i * 0.1);
    const y = Float64Array.from({ length: n }, () => 0.5 + 0.001 * g());
    expect(findTurningPoints(t, y)).toEqual([]);
  });

  it('finds nothing in monotonic input, noisy or not', () => {
    const g = gaussian(5);
    const t = Float64Array.from({ length: 3000 }, (_, i) => i * 0.1);
    expect(findTurningPoints(t, Float64Array.from(t, (v) => v * v))).toEqual([]);
    expect(findTurningPoints(t, Float64Array.from(t, (v) => 0.3 + 0.001 * v + 0.0005 * g()))).toEqual([]);
  });

  it('needs the signal to move back by the hysteresis; refines to the vertex of a sampled parabola exactly', () => {
    const t = [0, 1, 2, 3, 4, 5, 6, 7, 8];
    const wiggle = [0, 1, 0.5, 2, 0, 0, 0, 0, 0];
    expect(findTurningPoints(t, wiggle, { hysteresis: 0.6 }).map((p) => [p.index, p.kind])).toEqual([[3, 'max']]);
    const vertex = 3.37;
    const y = t.map((v) => 5 - (v - vertex) ** 2);
    const [p] = findTurningPoints(t, y, { hysteresis: 2, refineDrop: 30 });
    expect(p.kind).toBe('max');
    expect(p.index).toBe(3);
    expect(p.timeS).toBeCloseTo(vertex, 12);
    expect(p.value).toBeCloseTo(5, 12);
  });

  it('with includeEnd, reports the turning point a layer was cut on (or just before) as unconfirmed', () => {
    const periodS = 80;
    // cosine maxima at t = k·P; cut 0.5 % of a period after the one at 160 s, and 2 % before it
    for (const [endS, seed] of [[160 + 0.005 * periodS, 1], [160 - 0.02 * periodS, 2], [160 + 0.005 * periodS, 3]] as const) {
      const g = gaussian(seed);
      const n = Math.floor(endS / 0.1) + 1;
      const t = Float64Array.from({ length: n }, (_, i) => i * 0.1);
      const y = Float64Array.from(t, (v) => 0.6 + 0.2 * Math.cos((2 * Math.PI * v) / periodS) + 0.0006 * g());
      expect(findTurningPoints(t, y).every((p) => p.confirmed && p.timeS < 150)).toBe(true);
      const withEnd = findTurningPoints(t, y, { includeEnd: true });
      const last = withEnd[withEnd.length - 1];
      expect(last).toMatchObject({ kind: 'max', confirmed: false });
      expect(Math.abs(last.timeS - 160)).toBeLessThan(0.01 * periodS);
    }
  });

  it('with includeEnd, a series still rising steadily at its end gives no unconfirmed point', () => {
    for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
      const g = gaussian(seed);
      const t = Float64Array.from({ length: 1500 }, (_, i) => i * 0.1);
      // a fringe whose last stretch rises at a steady slope (cut mid-slope)
      const y = Float64Array.from(t, (v) => 0.6 + 0.2 * Math.sin((2 * Math.PI * v) / 60) + 0.0006 * g());
      const tp = findTurningPoints(t, y, { includeEnd: true });
      expect(tp.filter((p) => !p.confirmed)).toEqual([]);
    }
  });

  it('handles empty input and one sample; rejects NaN and mismatched lengths with exact messages', () => {
    expect(findTurningPoints([], [])).toEqual([]);
    expect(findTurningPoints([0], [1])).toEqual([]);
    expect(() => findTurningPoints([0, 1, 2], [1, NaN, 2])).toThrow(new RangeError('findTurningPoints: sample 1 is not finite (time 1, value NaN)'));
    expect(() => findTurningPoints([0, 1], [1])).toThrow(new RangeError('findTurningPoints: timeS has 2 samples but y has 1'));
    expect(() => findTurningPoints([0, 1, 2], [1, 2, 3], { hysteresis: 0 })).toThrow(new RangeError('findTurningPoints: hysteresis must be positive, got 0'));
  });
});
