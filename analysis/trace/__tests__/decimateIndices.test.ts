import { describe, expect, it } from 'vitest';
import { decimateIndices } from '../decimateIndices';

describe('decimateIndices', () => {
  it('returns a short stretch whole', () => {
    expect(Array.from(decimateIndices([5, 4, 3, 2, 1], 1, 4, 10))).toEqual([1, 2, 3]);
  });

  it('keeps a one-sample spike, the lowest dip and the worst residual, in order and within the bound', () => {
    const n = 100_000;
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 5000));
    const also = new Float64Array(n);
    y[31_337] = 7;
    y[77_001] = -9;
    also[50_123] = -0.4;
    const picked = decimateIndices(y, 0, n, 300, also);
    expect(picked.length).toBeLessThanOrEqual(300);
    expect(Array.from(picked)).toContain(31_337);
    expect(Array.from(picked)).toContain(77_001);
    expect(Array.from(picked)).toContain(50_123);
    for (let i = 1; i < picked.length; i++) expect(picked[i]).toBeGreaterThan(picked[i - 1]);
  });

  it('stays inside the asked stretch', () => {
    const y = Float64Array.from({ length: 10_000 }, (_, i) => (i * 7919) % 101);
    const picked = decimateIndices(y, 2_000, 3_000, 60);
    expect(Math.min(...picked)).toBeGreaterThanOrEqual(2_000);
    expect(Math.max(...picked)).toBeLessThan(3_000);
  });

  it('names a bad range or bound', () => {
    expect(() => decimateIndices([1, 2], 0, 3, 10)).toThrow('decimateIndices: [0, 3) is not a range of the 2 samples');
    expect(() => decimateIndices([1, 2], 0, 2, 2)).toThrow('decimateIndices: maxPoints must be an integer ≥ 3, got 2');
    expect(() => decimateIndices([1, 2], 0, 2, 5, [1])).toThrow('decimateIndices: also has 1 samples but y has 2');
  });
});
