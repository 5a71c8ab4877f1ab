import { describe, expect, it } from 'vitest';
import { decimateMinMax } from '../decimate';

describe('decimateMinMax', () => {
  it('keeps each bucket’s min and max in time order, so a one-sample spike survives', () => {
    const n = 1_000_000;
    const t = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      t[i] = i * 0.01;
      y[i] = Math.sin(i / 20000);
    }
    y[500_123] = 5;
    y[700_001] = -4;
    const d = decimateMinMax(t, y, 2000);
    expect(d.timeS.length).toBeLessThanOrEqual(2000);
    expect(d.timeS.length).toBe(d.y.length);
    for (let i = 1; i < d.timeS.length; i++) expect(d.timeS[i]).toBeGreaterThan(d.timeS[i - 1]);
    expect(Math.max(...d.y)).toBe(5);
    expect(Math.min(...d.y)).toBe(-4);
    expect(d.timeS[Array.from(d.y).indexOf(5)]).toBe(t[500_123]);
    expect(d.timeS[0]).toBe(0);
  });

  it('returns copies when the series already fits, and handles empty input', () => {
    const t = [0, 1, 2];
    const d = decimateMinMax(t, [5, 6, 7], 10);
    expect(Array.from(d.timeS)).toEqual(t);
    expect(d.y).toBeInstanceOf(Float64Array);
    expect(decimateMinMax([], [], 10).y.length).toBe(0);
  });

  it('a monotonic series keeps first and last of each bucket', () => {
    const t = Array.from({ length: 100 }, (_, i) => i);
    const d = decimateMinMax(t, t, 10);
    expect(Array.from(d.timeS)).toEqual([0, 19, 20, 39, 40, 59, 60, 79, 80, 99]);
  });

  it('rejects bad arguments with exact messages', () => {
    expect(() => decimateMinMax([1, 2], [1], 10)).toThrow(new RangeError('decimateMinMax: timeS has 2 samples but y has 1'));
    expect(() => decimateMinMax([1], [1], 1)).toThrow(new RangeError('decimateMinMax: maxPoints must be an integer ≥ 2, got 1'));
  });
});
