import { describe, expect, it } from 'vitest';
import { div, mul, sqrt } from '..';

describe('complex sqrt', () => {
  it('squares back to its argument, principal branch, for nearly real arguments too', () => {
    for (const a of [{ re: 1.14, im: -2.1e-11 }, { re: -3, im: 1e-14 }, { re: -3, im: -1e-14 }, { re: 2, im: 5 }, { re: -4, im: 0 }, { re: 1e-300, im: -1e-300 }]) {
      const r = sqrt(a);
      const back = mul(r, r);
      expect(r.re).toBeGreaterThanOrEqual(0);
      expect(back.re).toBeCloseTo(a.re, 12);
      expect(Math.abs(back.im - a.im)).toBeLessThanOrEqual(Math.abs(a.im) * 1e-12 + 1e-300);
    }
    expect(sqrt({ re: 1.14, im: -2.1e-11 }).im).toBeCloseTo(-2.1e-11 / (2 * Math.sqrt(1.14)), 22);
    expect(sqrt({ re: -4, im: 0 })).toEqual({ re: 0, im: 2 });
  });

  it("div uses Smith's algorithm without overflow", () => {
    expect(div({ re: 1e300, im: 1e300 }, { re: 1e300, im: 1e300 })).toEqual({ re: 1, im: 0 });
  });
});
