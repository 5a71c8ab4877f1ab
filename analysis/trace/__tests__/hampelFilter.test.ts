import { describe, expect, it } from 'vitest';
import { hampelFilter } from '../hampelFilter';
import { gaussian } from './rng';

describe('hampelFilter (the Hampel identifier, Pearson 2002)', () => {
  it('replaces a two-sample spike by the local median and leaves Gaussian samples as they are', () => {
    const z = gaussian(3);
    const y = Float64Array.from({ length: 5000 }, () => z());
    const spiked = Float64Array.from(y);
    spiked[2000] += 20;
    spiked[2001] += 20;
    const out = hampelFilter(spiked);
    expect(Math.abs(out[2000])).toBeLessThan(3);
    expect(Math.abs(out[2001])).toBeLessThan(3);
    // beyond 6 MAD-σ of 15 samples: a Gaussian sample seldom is (the MAD of 15 scatters ±20 %)
    let changed = 0;
    for (let i = 0; i < y.length; i++) if (i !== 2000 && i !== 2001 && out[i] !== y[i]) changed++;
    expect(changed).toBeLessThan(5);
  });

  it('keeps a level step', () => {
    const y = Float64Array.from({ length: 100 }, (_, i) => (i < 50 ? 0 : 1) + 0.01 * Math.sin(i));
    expect(Array.from(hampelFilter(y))).toEqual(Array.from(y));
  });

  it("flags and replaces exactly the samples the identifier's definition does, on quantised readings with ties and spikes", () => {
    // the definition written out: each window's median and MAD from a sort of its own values
    const z = gaussian(11);
    const y = Float64Array.from({ length: 3000 }, (_, i) => Math.round(4 * z()) / 4 + (i % 97 === 0 ? 9 : 0) + (i > 1500 ? 3 : 0));
    for (const h of [1, 3, 7]) {
      const expected = Float64Array.from(y);
      for (let i = 0; i < y.length; i++) {
        const a = Math.max(0, Math.min(i - h, y.length - 2 * h - 1));
        const win = Array.from(y.subarray(a, a + 2 * h + 1)).sort((p, q) => p - q);
        const med = win[h];
        const mad = 1.4826 * win.map((v) => Math.abs(v - med)).sort((p, q) => p - q)[h];
        if (Math.abs(y[i] - med) > 6 * mad && mad > 0) expected[i] = med;
      }
      const got = hampelFilter(y, h);
      expect(Array.from(got)).toEqual(Array.from(expected));
      expect(got.filter((v, i) => v !== y[i]).length).toBeGreaterThan(10);
    }
  });
});
