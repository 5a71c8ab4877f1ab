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
});
