import { describe, expect, it } from 'vitest';
import { fitLayers, startValues, type FitLayerData, type MonitorOptics } from '..';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };

function layerData(index: number, rate: number, drift: number, gain: number, noise: number, durationS: number, seed = 1): FitLayerData {
  const rng = createRng(seed);
  const n = Math.round(durationS / 0.1) + 1;
  const tauS = Float64Array.from({ length: n }, (_, i) => i * 0.1);
  const d = tauS.map((t) => rate * t + 0.5 * drift * t * t);
  const m = growingLayerSignal({ ...optics, below: [], growing: fromNK(index) }, d);
  const y = m.map((v) => gain * v + noise * gain * rng.normal());
  return { optics, nominalAt: () => fromNK(2.1), tauS, y, durationS: tauS[n - 1], extinction: 0, heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0 };
}

describe('fitLayers (one layer)', () => {
  it('recovers index, rate, drift and gain exactly from noiseless data, from the start grid', () => {
    const data = layerData(2.13, 0.31, 1e-4, 0.87, 0, 300);
    const sv = startValues({ optics, below: [], extinction: 0, tauS: data.tauS, y: data.y, offsetSignal: 0, index: 2.1, searchIndex: true, rateGuessNmPerS: 0.28 });
    const fit = fitLayers({ fixedBelow: [], layers: [data], offsetSignal: 0, start: [{ index: sv.index, rateNmPerS: sv.rateNmPerS, rateDriftNmPerS2: 0, gain: sv.gain }] });
    const e = fit.layers[0];
    expect(fit.solver.converged).toBe(true);
    expect(e.index).toBeCloseTo(2.13, 7);
    expect(e.rateNmPerS).toBeCloseTo(0.31, 8);
    expect(e.rateDriftNmPerS2).toBeCloseTo(1e-4, 10);
    expect(e.gain).toBeCloseTo(0.87, 8);
    expect(e.thicknessNm).toBeCloseTo(0.31 * 300 + 0.5e-4 * 300 * 300, 5);
  });

  it('agrees with the turning-point method: the index from the quarter-wave transmittance', () => {
    // Classical turning-point index (Macleod, Thin-Film Optical Filters, ch. 2, quarter-wave
    // layers): at the first extremum T = 4Y/(1 + Y)² with Y = n²/ns, so n = √(ns·Y).
    const data = layerData(2.2, 0.3, 0, 1, 0, 250);
    const fit = fitLayers({ fixedBelow: [], layers: [{ ...data, fitDrift: false }], offsetSignal: 0, start: [{ index: 2.15, rateNmPerS: 0.302, rateDriftNmPerS2: 0, gain: 1 }] });
    let tMin = Infinity;
    for (const v of data.y) tMin = Math.min(tMin, v);
    const y = (2 - tMin + 2 * Math.sqrt(1 - tMin)) / tMin; // the root Y > 1 of T·(1 + Y)² = 4Y
    expect(fit.layers[0].index).toBeCloseTo(Math.sqrt(1.52 * y), 3);
  });

  it('gives honest uncertainties on noisy data (error within 3σ) and holds a held index', () => {
    const z: number[] = [];
    for (let seed = 1; seed <= 12; seed++) {
      const data = layerData(2.1, 0.3, 5e-5, 1, 0.001, 400, seed);
      const e = fitLayers({ fixedBelow: [], layers: [data], offsetSignal: 0, start: [{ index: 2.1, rateNmPerS: 0.3, rateDriftNmPerS2: 0, gain: 1 }] }).layers[0];
      z.push(Math.abs(e.index - 2.1) / e.indexSigma, Math.abs(e.thicknessNm - (0.3 * 400 + 0.5 * 5e-5 * 400 * 400)) / e.thicknessSigmaNm);
    }
    expect(z.filter((v) => v < 3).length / z.length).toBeGreaterThanOrEqual(0.9);
    const held = layerData(2.1, 0.3, 0, 1, 0.001, 60);
    const e = fitLayers({ fixedBelow: [], layers: [{ ...held, heldIndex: 2.1, fitDrift: false }], offsetSignal: 0, start: [{ index: 2.1, rateNmPerS: 0.29, rateDriftNmPerS2: 0, gain: 1 }] }).layers[0];
    expect(e.index).toBe(2.1);
    expect(e.indexSigma).toBe(0);
    expect(e.rateDriftNmPerS2).toBe(0);
    expect(Math.abs(e.thicknessNm - 18) / e.thicknessSigmaNm).toBeLessThan(4);
  });
});
