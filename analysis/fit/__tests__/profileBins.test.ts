import { describe, expect, it } from 'vitest';
import { binsOnExposureClocks } from '../profileBins';
import { exposureTimes } from '../startTransient';
import { binMeans } from '../subsample';

// The bins of one real-time cut, read on each delay's exposure clock, must equal binning every
// sample's exposure time afresh (the slow way, sample by sample).
describe('binsOnExposureClocks', () => {
  it('gives each delay the bin means of the exposure times, sample by sample', () => {
    const n = 5003;
    const tau = Float64Array.from({ length: n }, (_, i) => i * 0.013 + (i % 7) * 0.001);
    const idx = Int32Array.from({ length: n }, (_, i) => i);
    const sig = Float64Array.from({ length: n }, (_, i) => Math.sin(i * 0.01));
    const at = binsOnExposureClocks(tau, idx, sig, 100);
    for (const d of [0.5, 1, 2.5, 3]) {
      const a = at(d), b = binMeans(tau, idx, sig, 100, exposureTimes(tau, d));
      expect(a.tauS.length).toBe(b.tauS.length);
      a.tauS.forEach((v, i) => expect(v).toBeCloseTo(b.tauS[i], 10));
      a.y.forEach((v, i) => expect(v).toBeCloseTo(b.y[i], 12));
    }
  });

  it('takes every sample as its own point when there are no more than the bins', () => {
    const tau = Float64Array.of(0, 0.5, 1, 2, 4);
    const at = binsOnExposureClocks(tau, Int32Array.of(0, 1, 2, 3, 4), Float64Array.of(1, 2, 3, 4, 5), 10);
    // E(τ) = τ²/(4δ) below 2δ, τ − δ after (δ = 1)
    expect(Array.from(at(1).tauS)).toEqual([0, 0.0625, 0.25, 1, 3]);
  });
});
