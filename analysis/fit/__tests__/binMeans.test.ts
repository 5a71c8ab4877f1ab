import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth/prng';
import { binMeans } from '../subsample';

/** Bin means the plain way, written here: each sample's bin from its τ, sums in sample order, empty bins left out. */
function naive(tauS: number[], indices: number[], signal: number[], maxPoints: number, valueTauS: number[]) {
  const t0 = tauS[0], span = tauS[tauS.length - 1] - t0 || 1;
  const bins = Array.from({ length: maxPoints }, () => ({ t: 0, y: 0, c: 0 }));
  tauS.forEach((tau, i) => {
    const b = Math.min(maxPoints - 1, Math.floor(((tau - t0) / span) * maxPoints));
    if (!(b >= 0)) return;
    bins[b].t += valueTauS[i];
    bins[b].y += signal[indices[i]];
    bins[b].c++;
  });
  const kept = bins.filter((b) => b.c > 0);
  return { tauS: kept.map((b) => b.t / b.c), y: kept.map((b) => b.y / b.c) };
}


describe('binMeans', () => {
  it('equals the plain per-sample sums bit for bit: jittered clocks, gaps, another value clock, picked indices', () => {
    for (let seed = 1; seed <= 30; seed++) {
      const rnd = createRng(seed).uniform;
      const n = 200 + Math.floor(rnd() * 3000);
      const tauS: number[] = [];
      let t = 0;
      for (let i = 0; i < n; i++) tauS.push((t += rnd() < 0.02 ? 0.5 + rnd() * 3 : 0.01 + rnd() * 0.02));
      const signal = Array.from({ length: n + 50 }, () => rnd());
      const indices = tauS.map((_, i) => i + Math.floor(rnd() * 50));
      const valueTauS = tauS.map((x) => x + 0.3 * rnd());
      for (const points of [7, 100, 150, n - 1]) {
        const got = binMeans(Float64Array.from(tauS), Int32Array.from(indices), Float64Array.from(signal), points, Float64Array.from(valueTauS));
        const want = naive(tauS, indices, signal, points, valueTauS);
        expect(Array.from(got.tauS)).toEqual(want.tauS);
        expect(Array.from(got.y)).toEqual(want.y);
      }
    }
  });

  it('samples out of time order come back to their bins; a τ of NaN is left out and the rest still binned', () => {
    const tauS = [0, 1, 2, 0.5, 3, 2.2, NaN, 4, 0.1, 5];
    const indices = tauS.map((_, i) => i);
    const signal = tauS.map((_, i) => i * i + 0.25);
    const got = binMeans(Float64Array.from(tauS), Int32Array.from(indices), Float64Array.from(signal), 5);
    const want = naive(tauS, indices, signal, 5, tauS);
    expect(Array.from(got.tauS)).toEqual(want.tauS);
    expect(Array.from(got.y)).toEqual(want.y);
    // (bins of width 1: [0,1) holds τ 0, 0.5, 0.1)
    expect(got.y[0]).toBeCloseTo((0.25 + 9.25 + 64.25) / 3, 12);
  });
});
