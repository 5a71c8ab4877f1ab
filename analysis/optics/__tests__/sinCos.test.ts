import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth/prng';
import { sinCos, sinCosOut } from '../sinCos';
import { ulp } from './ulp';

describe('sinCos', () => {
  it('agrees with Math.sin and Math.cos within 2 units in the last place (absolute 2.3e-16) over 300,000 arguments up to 10⁴', () => {
    const rnd = createRng(7).uniform;
    let worst = 0;
    for (let i = 0; i < 300_000; i++) {
      const span = [2e4, 20, 2e-3, 7][i % 4];
      const x = (rnd() - 0.5) * span;
      sinCos(x);
      const s = Math.sin(x), c = Math.cos(x);
      // near a zero of sin or cos the absolute error is what counts (the argument's own rounding dominates)
      worst = Math.max(worst, Math.abs(sinCosOut.sin - s) / Math.max(ulp(s), 1.1e-16), Math.abs(sinCosOut.cos - c) / Math.max(ulp(c), 1.1e-16));
    }
    expect(worst).toBeLessThanOrEqual(2);
  });

  it('exact values: sin π/6 = 1/2, cos π/3 = 1/2, sin² + cos² = 1, odd and even; the quadrants', () => {
    sinCos(Math.PI / 6);
    expect(sinCosOut.sin).toBeCloseTo(0.5, 15);
    sinCos(Math.PI / 3);
    expect(sinCosOut.cos).toBeCloseTo(0.5, 15);
    for (const x of [0.3, 1.9, 3.5, 5.1, -0.3, -1.9, -3.5, -5.1, 1234.5678]) {
      sinCos(x);
      const { sin, cos } = sinCosOut;
      expect(sin * sin + cos * cos).toBeCloseTo(1, 15);
      sinCos(-x);
      expect(sinCosOut.sin).toBe(-sin);
      expect(sinCosOut.cos).toBe(cos);
      expect(Math.sign(sin)).toBe(Math.sign(Math.sin(x)));
      expect(Math.sign(cos)).toBe(Math.sign(Math.cos(x)));
    }
    sinCos(0);
    expect([sinCosOut.sin, sinCosOut.cos]).toEqual([0, 1]);
  });

  it('a non-finite or very large argument: as the engine gives', () => {
    for (const x of [NaN, Infinity, -Infinity, 3e5, -1e12]) {
      sinCos(x);
      expect(sinCosOut.sin).toBe(Math.sin(x));
      expect(sinCosOut.cos).toBe(Math.cos(x));
    }
  });
});
