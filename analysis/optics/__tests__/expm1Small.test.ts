import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth/prng';
import { expm1Small } from '../expm1Small';
import { ulp } from './ulp';

describe('expm1Small', () => {
  it('agrees with Math.expm1 within 2 units in the last place over 200,000 arguments on both sides of its series branch', () => {
    const rnd = createRng(11).uniform;
    let worst = 0;
    for (let i = 0; i < 200_000; i++) {
      const span = [2e-3, 2e-6, 2e-12, 4][i % 4];
      const x = (rnd() - 0.5) * span;
      const want = Math.expm1(x);
      worst = Math.max(worst, Math.abs(expm1Small(x) - want) / ulp(want));
    }
    expect(worst).toBeLessThanOrEqual(2);
  });

  it('e^x − 1 at points worked by hand from the series (x + x²/2 + x³/6 + x⁴/24)', () => {
    // x = 0.0009999: 0.0009999 + 4.99900005e-7 + 1.66617e-10 + 4.2e-14
    expect(expm1Small(0.0009999)).toBeCloseTo(0.001000400066664, 14);
    expect(expm1Small(0)).toBe(0);
    // x = −0.0005: −0.0005 + 1.25e-7 − 2.0833e-11 + 2.6e-15
    expect(expm1Small(-5e-4)).toBeCloseTo(-4.9987502083073e-4, 16);
    // the series branch meets Math.expm1's at its edge with no step: across the edge's neighbouring
    // arguments the result moves by their difference times the slope e^x, within an ulp or two
    const xb = 0.001 * (1 - 2 ** -52);
    const step = expm1Small(0.001) - expm1Small(xb);
    expect(Math.abs(step - (0.001 - xb) * Math.exp(0.001))).toBeLessThanOrEqual(2 * ulp(0.001));
  });
});
