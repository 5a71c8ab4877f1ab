import { describe, expect, it } from 'vitest';
import { fitLayers } from '..';
import { createRng } from '../../synth';
import { chooseRateWander, wanderEndVariance } from '../wanderChoice';
import { prepareRateWander } from '../wanderPrep';
import { plainFit, wanderingLayer } from './wanderLayers';

/** A wandering layer (wanderLayers.ts) on its own random stream: what the chooser must tell apart. */
function layer(wanderFraction: number, seed: number, dtS?: number) {
  return wanderingLayer(wanderFraction, createRng(seed), dtS);
}

describe('chooseRateWander', () => {
  it('keeps the plain law for a steady rate under correlated noise', () => {
    let chosen = 0;
    const ratios: number[] = [];
    for (const seed of [1, 2, 3, 4, 8, 9, 10, 11]) {
      const l = layer(0, seed);
      const plain = plainFit(l.data);
      const c = chooseRateWander({ below: [], layer: l.data, estimate: plain.layers[0], offsetSignal: 0, gainPriorSigma: 0, allTauS: l.tauS, allY: l.y });
      if (c.wander) chosen++;
      // the noise's long-run σ: √(0.0003² + 0.0006²·(1 + ρ)/(1 − ρ)) = 0.0027 at 10 Hz
      ratios.push(c.sampleSigma / 0.0027);
    }
    // from 250 s of noise correlated over 1 s, one layer's estimate scatters by some 20 %
    ratios.sort((a, b) => a - b);
    expect(ratios[3]).toBeGreaterThan(0.8);
    expect(ratios[4]).toBeLessThan(1.25);
    expect(ratios[7]).toBeLessThan(2);
    expect(chosen).toBeLessThanOrEqual(1);
  });

  it('lets a wandering rate (3 %, 15 s) wander, and the fit then covers the end thickness', () => {
    let chosen = 0;
    for (const seed of [5, 6, 7]) {
      const l = layer(0.03, seed);
      const plain = plainFit(l.data);
      const c = chooseRateWander({ below: [], layer: l.data, estimate: plain.layers[0], offsetSignal: 0, gainPriorSigma: 0, allTauS: l.tauS, allY: l.y });
      if (!c.wander) continue;
      chosen++;
      const data = { ...l.data, wander: { ...c.wander, pointSigma: c.wander.pointSigma * Math.sqrt(l.data.tauS.length / l.tauS.length) } };
      const e0 = plain.layers[0];
      const fit = fitLayers({ fixedBelow: [], layers: [data], offsetSignal: 0, start: [{ ...e0 }] });
      const e = fit.layers[0];
      expect(Math.abs(e.thicknessNm - l.endNm)).toBeLessThan(3 * e.thicknessSigmaNm);
      // what holding the wander would cost is part of its σ (a Schur complement: within the total)
      expect(wanderEndVariance(data, fit.solver.covariance)).toBeGreaterThan(0);
      expect(wanderEndVariance(data, fit.solver.covariance)).toBeLessThanOrEqual(e.thicknessSigmaNm ** 2 * 1.0001);
    }
    expect(chosen).toBeGreaterThanOrEqual(2);
  });

  // A fast trace is binned to bins of at least 0.3 s (fit/wanderPrep.ts BIN_S), not three samples:
  // the same noise model and choice as at 10 Hz, on a tenth of the rows.
  it('reads a 100 Hz trace on bins of 0.3 s and chooses as at 10 Hz', () => {
    let steadyChosen = 0, wanderingChosen = 0;
    const ratios: number[] = [];
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      for (const fraction of [0, 0.03]) {
        const l = layer(fraction, seed, 0.01);
        const plain = plainFit(l.data);
        const input = { below: [], layer: l.data, estimate: plain.layers[0], offsetSignal: 0, gainPriorSigma: 0, allTauS: l.tauS, allY: l.y };
        const prep = prepareRateWander(input);
        // 25 000 samples in bins of 30 (0.3 s)
        expect(prep.per).toBeGreaterThan(29);
        expect(prep.per).toBeLessThan(31);
        expect(prep.N).toBe(Math.floor(l.tauS.length / 30));
        const c = chooseRateWander(input);
        if (fraction === 0) {
          if (c.wander) steadyChosen++;
          // the noise's long-run σ at 100 Hz: √(0.0003² + 0.0006²·(1 + ρ)/(1 − ρ)), ρ = e^(−0.01): white plus
          // AR(1), whose long-run variance is σ²(1 + ρ)/(1 − ρ) (Box and Jenkins, "Time Series Analysis"; from memory)
          const rho = Math.exp(-0.01);
          ratios.push(c.sampleSigma / Math.sqrt(0.0003 ** 2 + 0.0006 ** 2 * ((1 + rho) / (1 - rho))));
        } else if (c.wander) wanderingChosen++;
      }
    }
    ratios.sort((a, b) => a - b);
    expect(ratios[2]).toBeGreaterThan(0.8);
    expect(ratios[3]).toBeLessThan(1.25);
    expect(steadyChosen).toBeLessThanOrEqual(1);
    expect(wanderingChosen).toBeGreaterThanOrEqual(4);
  }, 60_000);
});
