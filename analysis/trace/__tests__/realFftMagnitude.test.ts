import fftjs from 'fft-js';
import { describe, expect, it } from 'vitest';
import { realFftMagnitude } from '../realFftMagnitude';
import { gaussian } from './rng';

describe('realFftMagnitude', () => {
  it('equals fft-js on the real series (random input, several lengths)', () => {
    const g = gaussian(8);
    for (const n of [4, 8, 64, 1024, 4096]) {
      const x = Array.from({ length: n }, () => g());
      const direct = fftjs.util.fftMag(fftjs.fft(x));
      const fast = realFftMagnitude(x);
      expect(fast.length).toBe(direct.length);
      for (let k = 0; k < direct.length; k++) expect(Math.abs(fast[k] - direct[k])).toBeLessThan(1e-9 * Math.sqrt(n));
    }
  });

  it('a cosine on a bin gives N/2 there (DFT identity), a constant gives N at k = 0', () => {
    const n = 256;
    const cos = realFftMagnitude(Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * 10 * i) / n)));
    expect(cos[10]).toBeCloseTo(n / 2, 9);
    expect(cos[11]).toBeLessThan(1e-9);
    expect(realFftMagnitude(new Array(n).fill(1))[0]).toBeCloseTo(n, 9);
  });

  it('rejects a length that is not a power of two', () => {
    expect(() => realFftMagnitude([1, 2, 3, 4, 5, 6])).toThrow(new RangeError('realFftMagnitude: length must be a power of two ≥ 4, got 6'));
  });
});
