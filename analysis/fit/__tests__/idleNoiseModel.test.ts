import { describe, expect, it } from 'vitest';
import { idleNoiseModel, meanVariance } from '../idleNoiseModel';
import { type TraceData } from '../../trace';
import { gaussian } from '../../trace/__tests__/rng';

// The variance of a mean of m samples of white + AR(1) noise (Box & Jenkins, "Time Series
// Analysis" (1970): Var(x̄) = (σ²/m)·[1 + 2·Σ_{k<m} (1 − k/m)·ρ_k]) and the run's noise read from
// its idle stretches.

function ar1PlusWhite(n: number, whiteSigma: number, ar1Sigma: number, rho: number, seed: number): Float64Array {
  const z = gaussian(seed);
  const out = new Float64Array(n);
  let x = ar1Sigma * z();
  for (let i = 0; i < n; i++) {
    x = rho * x + ar1Sigma * Math.sqrt(1 - rho * rho) * z();
    out[i] = x + whiteSigma * z();
  }
  return out;
}

describe('meanVariance', () => {
  const noise = { whiteVar: 4, ar1Var: 9, rho: 0.8, longRunSigma: Math.sqrt(4 + (9 * 1.8) / 0.2) };

  it('is the variance of one sample for m = 1, and σ²/m for uncorrelated noise', () => {
    expect(meanVariance(noise, 1)).toBeCloseTo(13, 12);
    expect(meanVariance({ ...noise, rho: 0 }, 10)).toBeCloseTo(13 / 10, 12);
  });

  it('tends to the long-run variance over m, σ_w² + σ_x²·(1 + ρ)/(1 − ρ), for long means (Box & Jenkins)', () => {
    const m = 20000;
    expect(meanVariance(noise, m) * m).toBeCloseTo(noise.longRunSigma ** 2, 0);
  });

  it('agrees with the spread of simulated block means (ρ = 0.82, blocks of 15 samples)', () => {
    const rho = 0.82, m = 15;
    const series = ar1PlusWhite(300_000, 0.4, 0.6, rho, 7);
    let s = 0, ss = 0, k = 0;
    for (let i = 0; i + m <= series.length; i += m, k++) {
      let mean = 0;
      for (let j = 0; j < m; j++) mean += series[i + j] / m;
      s += mean;
      ss += mean * mean;
    }
    const measured = ss / k - (s / k) ** 2;
    const predicted = meanVariance({ whiteVar: 0.16, ar1Var: 0.36, rho, longRunSigma: 0 }, m);
    // 20 000 block means: the sample variance is within about 1 % (σ of a variance ≈ √(2/k)).
    expect(Math.abs(measured / predicted - 1)).toBeLessThan(0.05);
  });
});

describe('idleNoiseModel', () => {
  it('reads white + AR(1) noise from flat idle stretches at different levels', () => {
    const rho = 0.82;
    const noise = ar1PlusWhite(6000, 0.0004, 0.0006, rho, 11);
    // Ten idle stretches of 300 samples, each at a level of its own with a step in the middle
    // (a chip change: old level, then bare chip), separated by 300 samples of "layer".
    const signal = new Float64Array(6000);
    const idle: { startIndex: number; endIndex: number }[] = [];
    for (let b = 0; b < 10; b++) {
      const start = b * 600;
      for (let i = 0; i < 600; i++) signal[start + i] = (i < 150 ? 0.3 + 0.05 * b : i < 300 ? 0.9 : 0.5 + 0.2 * Math.sin(i / 40)) + noise[start + i];
      idle.push({ startIndex: start, endIndex: start + 300 });
    }
    const model = idleNoiseModel({ signal } as unknown as TraceData, idle)!;
    expect(model).not.toBeNull();
    // The level steps are not read as noise: the AR(1) variance within 30 %, ρ within 0.1.
    expect(Math.abs(model.ar1Var / 0.0006 ** 2 - 1)).toBeLessThan(0.3);
    expect(Math.abs(model.rho - rho)).toBeLessThan(0.1);
  });
});
