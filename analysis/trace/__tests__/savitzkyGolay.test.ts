import { describe, expect, it } from 'vitest';
import { savitzkyGolay, savitzkyGolayCoefficients } from '../savitzkyGolay';

const close = (a: ArrayLike<number>, b: ArrayLike<number>, tol: number) => {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < a.length; i++) expect(Math.abs(a[i] - b[i])).toBeLessThan(tol);
};

describe('savitzkyGolayCoefficients', () => {
  // Savitzky & Golay 1964, Anal. Chem. 36, 1627, Table I (quadratic/cubic smoothing), normalised by their "norm" column
  it('5-point quadratic smoothing: (-3, 12, 17, 12, -3)/35', () => {
    close(savitzkyGolayCoefficients(5, 2), [-3, 12, 17, 12, -3].map((c) => c / 35), 1e-14);
  });
  it('7-point quadratic smoothing: (-2, 3, 6, 7, 6, 3, -2)/21', () => {
    close(savitzkyGolayCoefficients(7, 2), [-2, 3, 6, 7, 6, 3, -2].map((c) => c / 21), 1e-14);
  });
  // 9-point values from memory of the same table
  it('cubic smoothing equals quadratic at the centre (same paper: one table serves both)', () => {
    close(savitzkyGolayCoefficients(9, 3), savitzkyGolayCoefficients(9, 2), 1e-13);
    close(savitzkyGolayCoefficients(9, 2), [-21, 14, 39, 54, 59, 54, 39, 14, -21].map((c) => c / 231), 1e-14);
  });
  // Savitzky & Golay 1964, Table III (first derivative, quadratic), 5 points: (-2, -1, 0, 1, 2)/10 (from memory)
  it('5-point first derivative: (-2, -1, 0, 1, 2)/10', () => {
    close(savitzkyGolayCoefficients(5, 2, 1), [-2, -1, 0, 1, 2].map((c) => c / 10), 1e-14);
  });
  it('rejects an even window and an order too high, with exact messages', () => {
    expect(() => savitzkyGolayCoefficients(6, 2)).toThrow(new RangeError('savitzkyGolay: window must be an odd positive integer, got 6'));
    expect(() => savitzkyGolay([1, 2, 3], { window: 5, order: 5 })).toThrow(
      new RangeError('savitzkyGolay: order must be an integer from 0 to window − 1 (4), got 5'),
    );
  });
});

describe('savitzkyGolay', () => {
  it('applied to an impulse gives the centred weights', () => {
    const y = new Float64Array(21);
    y[10] = 1;
    const s = savitzkyGolay(y, { window: 7, order: 2 });
    close(s.subarray(7, 14), [-2, 3, 6, 7, 6, 3, -2].map((c) => c / 21), 1e-14);
  });

  it('preserves polynomials of degree ≤ order exactly, edges included', () => {
    const x = Array.from({ length: 40 }, (_, i) => i);
    for (const order of [0, 1, 2, 3, 4]) {
      const p = x.map((v) => [1, -0.3, 0.02, -0.001, 1e-5].slice(0, order + 1).reduce((s, c, j) => s + c * v ** j, 0));
      close(savitzkyGolay(p, { window: 11, order }), p, 1e-9);
    }
  });

  it('differentiates a cubic exactly with the sample spacing applied', () => {
    const dx = 0.1;
    const t = Array.from({ length: 50 }, (_, i) => i * dx);
    const y = t.map((v) => 2 + v - 0.5 * v * v + 0.1 * v ** 3);
    const dy = t.map((v) => 1 - v + 0.3 * v * v);
    close(savitzkyGolay(y, { window: 9, order: 3, derivative: 1, dx }), dy, 1e-9);
  });

  it('reduces white noise by the expected factor √Σc² (quadratic, 11 points)', () => {
    let state = 12345;
    const rand = () => ((state = (state * 1103515245 + 12345) % 2147483648) / 2147483648) - 0.5;
    const y = Array.from({ length: 20000 }, rand);
    const s = savitzkyGolay(y, { window: 11, order: 2 });
    const rms = (a: ArrayLike<number>) => Math.sqrt(Array.from(a).reduce((q, v) => q + v * v, 0) / a.length);
    const gain = Math.hypot(...savitzkyGolayCoefficients(11, 2));
    expect(rms(s.subarray(5, -5)) / rms(y)).toBeCloseTo(gain, 1);
  });

  it('handles empty, one sample and a series shorter than the window', () => {
    expect(savitzkyGolay([])).toEqual(new Float64Array(0));
    expect(Array.from(savitzkyGolay([3.5]))).toEqual([3.5]);
    expect(Array.from(savitzkyGolay([3.5], { derivative: 1 }))).toEqual([0]);
    close(savitzkyGolay([1, 2, 3, 4], { window: 11, order: 3 }), [1, 2, 3, 4], 1e-12);
  });

  it('rejects NaN with the index', () => {
    expect(() => savitzkyGolay([1, 2, NaN, 4])).toThrow(new RangeError('savitzkyGolay: y[2] is not a finite number (NaN)'));
  });
});
