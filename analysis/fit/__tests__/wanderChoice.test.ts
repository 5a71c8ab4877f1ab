import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { fromNK, growingLayerSignal } from '../../optics';
import { createRng } from '../../synth';
import { binMeans } from '../subsample';
import { chooseRateWander, wanderEndVariance } from '../wanderChoice';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 600, mode: 'T' };
const DT = 0.1;

/**
 * One quarter-wave-ish layer (n = 2.3, 0.25 nm/s, 250 s) whose rate wanders as an OU process
 * (integrated here by the rectangle rule at 10 Hz, not by fit/rateWander), with white + AR(1)
 * noise of a lock-in (1 s): what the chooser must tell apart.
 */
function layer(wanderFraction: number, seed: number) {
  const rng = createRng(seed);
  const n = 2500, rate = 0.25;
  const tauS = Float64Array.from({ length: n }, (_, i) => i * DT);
  const d = new Float64Array(n);
  const rhoW = Math.exp(-DT / 15);
  let w = wanderFraction * rng.normal();
  for (let i = 1; i < n; i++) {
    d[i] = d[i - 1] + rate * (1 + w) * DT;
    w = rhoW * w + wanderFraction * Math.sqrt(1 - rhoW * rhoW) * rng.normal();
  }
  const m = growingLayerSignal({ ...optics, below: [], growing: fromNK(2.3), pol: 's' }, d);
  const rhoN = Math.exp(-DT / 1);
  let x = 0.0006 * rng.normal();
  const y = m.map((v) => {
    x = rhoN * x + 0.0006 * Math.sqrt(1 - rhoN * rhoN) * rng.normal();
    return v + x + 0.0003 * rng.normal();
  });
  const bins = binMeans(tauS, Int32Array.from({ length: n }, (_, i) => i), y, 400);
  const data: FitLayerData = {
    optics, nominalAt: () => fromNK(2.3), tauS: bins.tauS, y: bins.y, durationS: tauS[n - 1], extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
  return { tauS, y, data, endNm: d[n - 1] };
}

function plainFit(data: FitLayerData) {
  return fitLayers({ fixedBelow: [], layers: [data], offsetSignal: 0, start: [{ index: 2.29, rateNmPerS: 0.251, rateDriftNmPerS2: 0, gain: 1 }] });
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
});
