import { describe, expect, it } from 'vitest';
import { addToLongVariogram, fitLongVariogram, newLongVariogram, newVariogramPool, addToVariogramPool, fitPooledVariogram } from '..';
import { gaussian } from '../../trace/__tests__/rng';

// Noise of known σ and correlation from the published AR(1) form: x_t = φ·x_{t−1} + a_t, a_t white
// of variance σ_a², has variance σ_a²/(1 − φ²) and autocorrelation φ^k (G. E. P. Box,
// G. M. Jenkins, "Time Series Analysis", Holden-Day (1970), §3.2.4; D. B. Percival, A. T. Walden,
// "Spectral Analysis for Physical Applications", CUP (1993), §2.6), so its semivariogram is
// σ²·(1 − φ^k) and with independent white noise of variance σ_w² added, σ_w² + σ²·(1 − φ^k).
// The correlation time in samples is −1/ln φ.

/** Stretches of white + AR(1) noise, each at a level of its own, the AR(1) part running on between them (as a detector's noise between layers). */
function stretches(lengths: readonly number[], phi: number, sigmaA: number, sigmaW: number, seed: number, gapSamples = 0): Float64Array[] {
  const z = gaussian(seed);
  let x = (sigmaA / Math.sqrt(1 - phi * phi)) * z();
  return lengths.map((n, j) => {
    for (let g = 0; g < gapSamples; g++) x = phi * x + sigmaA * z();
    const level = 0.3 + 0.1 * (j % 7);
    return Float64Array.from({ length: n }, () => {
      x = phi * x + sigmaA * z();
      return level + x + sigmaW * z();
    });
  });
}

/** Lengths of a run's idle stretches at 100 samples/s: a 20 s bare chip now and then, 3–6 s between layers. */
function idleLengths(count: number, seed: number): number[] {
  const z = gaussian(seed);
  return Array.from({ length: count }, (_, j) => (j % 6 === 0 ? 2000 : 300 + Math.round(100 * Math.abs(z()) * 3)));
}

describe('the variogram pooled over stretches at every lag', () => {
  it('follows σ²·(1 − φ^k) at lags from one sample to several correlation times, each stretch at its own level (Box & Jenkins)', () => {
    const phi = Math.exp(-1 / 100), sigmaA = 1e-4;
    const variance = sigmaA ** 2 / (1 - phi * phi);
    const v = newLongVariogram(1000);
    for (const s of stretches(idleLengths(60, 3), phi, sigmaA, 0, 4)) addToLongVariogram(s, v);
    for (const want of [1, 10, 50, 100, 200, 400]) {
      // the lag read nearest to it
      const q = v.lags.reduce((best, k, i) => (Math.abs(k - want) < Math.abs(v.lags[best] - want) ? i : best), 0);
      const k = v.lags[q];
      expect(Math.abs(k / want - 1)).toBeLessThan(0.05);
      const expected = variance * (1 - phi ** k);
      // one run's scatter: a few % at short lags, ~10 % at 4 correlation times
      expect(Math.abs(v.sums[q] / v.counts[q] / expected - 1)).toBeLessThan(k <= 100 ? 0.08 : 0.15);
    }
  });
});

describe('white + AR(1) noise from the pooled variogram (Cressie\'s weighted least squares)', () => {
  // 100 samples/s; τ = 1 s and 3 s; σ_w = 0.03 %, the AR(1) σ = 0.06 % (a lock-in's noise).
  const sigmaW = 0.0003, sigmaX = 0.0006;
  for (const tauS of [1, 3]) {
    it(`reads a ${tauS} s correlation and the whole σ from idle stretches of 3–20 s at 100 samples/s, where 40 lags read it short`, () => {
      const phi = Math.exp(-1 / (100 * tauS));
      const sigmaA = sigmaX * Math.sqrt(1 - phi * phi);
      const total = Math.hypot(sigmaW, sigmaX);
      const ratios: number[] = [], taus: number[] = [], old: number[] = [], oldTaus: number[] = [];
      for (let seed = 1; seed <= 6; seed++) {
        const parts = stretches(idleLengths(40, seed), phi, sigmaA, sigmaW, 100 + seed, 6000);
        const v = newLongVariogram(2000);
        for (const s of parts) addToLongVariogram(s, v);
        const f = fitLongVariogram(v)!;
        ratios.push(Math.sqrt(f.whiteVar + f.ar1Var) / total);
        taus.push(-1 / Math.log(f.rho) / 100);
        // the variogram on 40 lags, as the idle noise model read it before
        const pool = newVariogramPool();
        let lags: number[] = [];
        for (const s of parts) lags = addToVariogramPool(s, 40, pool);
        const g = fitPooledVariogram(lags, pool);
        old.push(Math.sqrt(g.whiteVar + g.ar1Var) / total);
        oldTaus.push(g.rho > 0 ? -1 / Math.log(g.rho) / 100 : 0);
      }
      const mean = (a: number[]) => a.reduce((s, x) => s + x, 0) / a.length;
      // The total σ on average over six runs within 5 % (τ = 1 s) or 10 % (3 s: about 70 s of idle
      // a run, some 25 correlation times, leave a run's σ ±10 %), none beyond 20 %; τ within 30 %.
      expect(Math.abs(mean(ratios) - 1)).toBeLessThan(tauS === 1 ? 0.05 : 0.1);
      for (const r of ratios) expect(Math.abs(r - 1)).toBeLessThan(0.2);
      expect(Math.abs(mean(taus) / tauS - 1)).toBeLessThan(0.3);
      // 40 lags (0.4 s) read the correlation short and the σ low (0.75 and 0.58 of the truth)
      expect(mean(old)).toBeLessThan(0.8);
      expect(mean(oldTaus)).toBeLessThan(0.5 * tauS);
    });
  }

  it('finds white noise white', () => {
    const v = newLongVariogram(1000);
    for (const s of stretches(idleLengths(30, 5), 0, 0, 0.001, 6)) addToLongVariogram(s, v);
    const f = fitLongVariogram(v)!;
    expect(Math.abs(f.longRunSigma / 0.001 - 1)).toBeLessThan(0.05);
    expect(Math.sqrt(f.ar1Var)).toBeLessThan(0.0002);
  });

  it('reads a short correlation (0.1 s at 100 samples/s) as well: the long-run σ σ_w² + σ²·(1 + φ)/(1 − φ) (Box & Jenkins)', () => {
    const phi = Math.exp(-1 / 10), sigmaA = 0.0006 * Math.sqrt(1 - phi * phi);
    const v = newLongVariogram(2000);
    for (const s of stretches(idleLengths(30, 8), phi, sigmaA, 0.0003, 9)) addToLongVariogram(s, v);
    const f = fitLongVariogram(v)!;
    const longRun = Math.sqrt(0.0003 ** 2 + (0.0006 ** 2 * (1 + phi)) / (1 - phi));
    expect(Math.abs(f.longRunSigma / longRun - 1)).toBeLessThan(0.1);
    expect(Math.abs(-1 / Math.log(f.rho) - 10)).toBeLessThan(2);
  });
});
