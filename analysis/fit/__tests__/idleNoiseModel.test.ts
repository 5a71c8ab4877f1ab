import { describe, expect, it } from 'vitest';
import { gapsBetween, idleNoiseModel, meanVariance } from '../idleNoiseModel';
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

  /**
   * A trace at 100 samples/s: a 20 s bare chip every sixth pause, 3–6 s pauses between layers,
   * each pause at a level of its own, 60 s of layer between pauses (a slow fringe), the noise
   * running on through the layers. White σ_w plus AR(1) x_t = φ·x_{t−1} + a_t of variance
   * σ_a²/(1 − φ²) (Box & Jenkins (1970), §3.2.4).
   */
  function pausedTrace(tauS: number, seed: number, extra?: (pause: Float64Array, j: number) => void): { signal: Float64Array; idle: { startIndex: number; endIndex: number }[] } {
    const phi = Math.exp(-0.01 / tauS), sigmaX = 0.0006, sigmaA = sigmaX * Math.sqrt(1 - phi * phi);
    const z = gaussian(seed);
    const lengths = Array.from({ length: 24 }, (_, j) => (j % 6 === 0 ? 2000 : 300 + 100 * (j % 4)));
    const signal = new Float64Array(lengths.reduce((a, n) => a + n + 6000, 0));
    const idle: { startIndex: number; endIndex: number }[] = [];
    let x = sigmaX * z(), i = 0;
    lengths.forEach((n, j) => {
      idle.push({ startIndex: i, endIndex: i + n });
      for (let k = 0; k < n + 6000; k++, i++) {
        x = phi * x + sigmaA * z();
        const level = k < n ? 0.4 + 0.08 * (j % 7) : 0.5 + 0.3 * Math.sin(k / 950);
        signal[i] = level + x + 0.0003 * z();
      }
      extra?.(signal.subarray(i - n - 6000, i - 6000), j);
    });
    return { signal, idle };
  }
  const truth = Math.hypot(0.0003, 0.0006);

  for (const tauS of [1, 3]) {
    it(`reads a ${tauS} s correlation at 100 samples/s and the whole σ (it read 0.5–0.7 of it from 40 lags, the noise's own wander cut into levels)`, () => {
      const sigmas: number[] = [], taus: number[] = [];
      for (let seed = 1; seed <= 4; seed++) {
        const { signal, idle } = pausedTrace(tauS, 40 + seed);
        const m = idleNoiseModel({ signal } as unknown as TraceData, idle)!;
        sigmas.push(Math.sqrt(m.whiteVar + m.ar1Var) / truth);
        taus.push(-0.01 / Math.log(m.rho) / tauS);
      }
      const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
      // about 150 s of pauses a run: the total σ within 10 % on average, τ within 35 %
      expect(Math.abs(mean(sigmas) - 1)).toBeLessThan(0.1);
      expect(Math.abs(mean(taus) - 1)).toBeLessThan(0.35);
    });
  }

  it('reads white noise as white: a slow part only where the likelihood tells it (a 20 s pause a run at 10 samples/s)', () => {
    // 0.1 % white noise, pauses of 3 s and one of 20 s: the few long lags scatter, and a fit of
    // the variogram alone found a slow part there (σ_x 3–4e-4, τ 2–8 s on seeds 22–23 of the
    // synthetic mirror), which would floor every fit's correlation time.
    for (let seed = 1; seed <= 6; seed++) {
      const z = gaussian(200 + seed);
      const lengths = [200, ...Array.from({ length: 18 }, () => 30)];
      const signal = new Float64Array(lengths.reduce((a, n) => a + n + 600, 0));
      const idle: { startIndex: number; endIndex: number }[] = [];
      let i = 0;
      lengths.forEach((n, j) => {
        idle.push({ startIndex: i, endIndex: i + n });
        for (let k = 0; k < n + 600; k++, i++) signal[i] = (k < n ? 0.4 + 0.05 * (j % 9) : 0.5 + 0.3 * Math.sin(k / 90)) + 0.001 * z();
      });
      const m = idleNoiseModel({ signal } as unknown as TraceData, idle)!;
      expect(m.ar1Var).toBe(0);
      expect(Math.abs(Math.sqrt(m.whiteVar) / 0.001 - 1)).toBeLessThan(0.1);
    }
  });

  it('leaves out spikes and a dark transient between two levels', () => {
    const clean = pausedTrace(1, 7);
    const base = idleNoiseModel({ signal: clean.signal } as unknown as TraceData, clean.idle)!;
    const { signal, idle } = pausedTrace(1, 7, (pause, j) => {
      // a two-sample spike of 0.5 % every 2 s; in every bare-chip stretch but the first a 30-sample
      // ramp up from dark (the lamp's transient) after 100 samples of the old chip's level
      for (let k = 150; k + 1 < pause.length; k += 200) {
        pause[k] += 0.005;
        pause[k + 1] += 0.005;
      }
      if (j % 6 === 0 && j > 0) {
        for (let k = 0; k < 100; k++) pause[k] += 0.3;
        for (let k = 100; k < 130; k++) pause[k] -= 0.4 * (1 - (k - 100) / 30);
      }
    });
    const m = idleNoiseModel({ signal } as unknown as TraceData, idle)!;
    expect(Math.abs(Math.sqrt(m.whiteVar + m.ar1Var) / Math.sqrt(base.whiteVar + base.ar1Var) - 1)).toBeLessThan(0.05);
    expect(Math.abs(m.rho - base.rho)).toBeLessThan(0.002);
  });
});

describe('gapsBetween', () => {
  it('gives the stretches before and between the layers, in the trace\'s order', () => {
    const layers = [{ startIndex: 500, endIndex: 900 }, { startIndex: 100, endIndex: 400 }, { startIndex: 900, endIndex: 1200 }];
    expect(gapsBetween(layers)).toEqual([{ startIndex: 0, endIndex: 100 }, { startIndex: 400, endIndex: 500 }]);
  });
});
