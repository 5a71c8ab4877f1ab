import { describe, expect, it } from 'vitest';
import { largest, smallest } from '../extremes';

describe('largest and smallest of a typed array', () => {
  const a = Float64Array.from([0.3, -2, 7.5, NaN, 1, -9]);
  it('over the whole array, NaN passed over', () => {
    expect(largest(a)).toBe(7.5);
    expect(smallest(a)).toBe(-9);
  });
  it('over the first n values only', () => {
    expect(largest(a, 2)).toBe(0.3);
    expect(smallest(a, 2)).toBe(-2);
  });
  it('of no values: the identities of max and min', () => {
    expect(largest(a, 0)).toBe(-Infinity);
    expect(smallest(new Float64Array(0))).toBe(Infinity);
  });
});
