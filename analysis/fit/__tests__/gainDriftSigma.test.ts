import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type LayerEstimate, type MonitorOptics } from '..';
import { carryJointGainDriftSigma, swapGainDriftShare } from '../gainDriftSigma';
import { carryOffsetSigma } from '../offsetSigma';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };

/** Three layers on one chip read through a steady gain 0.9 with a small offset, white noise. */
function chip(seed: number): FitLayerData[] {
  const rng = createRng(seed);
  const plan = [{ index: 2.1, rate: 0.3, durationS: 260, startS: 0 }, { index: 1.46, rate: 0.5, durationS: 190, startS: 265 }, { index: 2.1, rate: 0.3, durationS: 130, startS: 460 }];
  const below: { n: ReturnType<typeof fromNK>; thicknessNm: number }[] = [];
  return plan.map((l) => {
    const n = Math.round(l.durationS / 0.5) + 1;
    const tauS = Float64Array.from({ length: n }, (_, i) => i * 0.5);
    const m = growingLayerSignal({ ...optics, below: [...below], growing: fromNK(l.index) }, tauS.map((t) => l.rate * t));
    below.push({ n: fromNK(l.index), thicknessNm: l.rate * l.durationS });
    const y = m.map((v) => 0.9 * v + 0.004 + 0.002 * rng.normal());
    return { optics, nominalAt: () => fromNK(l.index), tauS, y, durationS: tauS[n - 1], extinction: 0, heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: l.startS };
  });
}

const copy = (layers: readonly LayerEstimate[]) => layers.map((l) => ({ ...l }));
/** The σ each way adds over the joint fit's own (thickness, index): present, and alike within 5 %. */
function expectSameAddedSigma(base: readonly LayerEstimate[], step: readonly LayerEstimate[], refit: readonly LayerEstimate[]): void {
  base.forEach((b, j) => {
    const added = (e: LayerEstimate) => Math.sqrt(e.thicknessSigmaNm ** 2 - b.thicknessSigmaNm ** 2);
    const addedN = (e: LayerEstimate) => Math.sqrt(e.indexSigma ** 2 - b.indexSigma ** 2);
    expect(added(refit[j])).toBeGreaterThan(0.1 * b.thicknessSigmaNm);
    expect(Math.abs(added(step[j]) / added(refit[j]) - 1)).toBeLessThan(0.05);
    expect(Math.abs(addedN(step[j]) / addedN(refit[j]) - 1)).toBeLessThan(0.05);
  });
}

const start = [2.1, 1.46, 2.1].map((index, j) => ({ index, rateNmPerS: j === 1 ? 0.5 : 0.3, rateDriftNmPerS2: 0, gain: 0.9 }));

describe('σ carried from a held gain drift and a held offset after a joint fit', () => {
  // The Gauss–Newton step from the converged joint fit (first-order propagation) against the joint
  // fit repeated with the held value moved by its σ: equal to first order; both counted from the
  // same solution. Measured on these chips: the added σ of thickness and index within 2.5 %.
  it('one Gauss–Newton step adds the same σ as a refit with the drift one σ off', () => {
    const data = chip(11);
    const sharedGain = { gain: 0.9, driftPerS: 0, fitDrift: false };
    const joint = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0.004, sharedGain: { ...sharedGain } });
    const sigma = 3e-6; // about 1 %/h, the default lamp stability
    const step = copy(joint.layers), refit = copy(joint.layers);
    carryJointGainDriftSigma(data, step, 0.004, sigma, { ...sharedGain }, false, joint);
    carryJointGainDriftSigma(data, refit, 0.004, sigma, { ...sharedGain }, false);
    expectSameAddedSigma(joint.layers, step, refit);
  });

  it('one Gauss–Newton step adds the same σ as a refit with the offset one σ off', () => {
    const data = chip(12);
    const sharedGain = { gain: 0.9, driftPerS: 0, fitDrift: false };
    const joint = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0.004, sharedGain: { ...sharedGain } });
    const step = copy(joint.layers), refit = copy(joint.layers);
    carryOffsetSigma(data, step, 0.004, 0.004, { ...sharedGain }, false, joint);
    carryOffsetSigma(data, refit, 0.004, 0.004, { ...sharedGain }, false);
    expectSameAddedSigma(joint.layers, step, refit);
  });
});

describe('the gain drift\'s share of a layer\'s σ, swapped after the pass', () => {
  const base = (): LayerEstimate => ({ index: 2, rateNmPerS: 0.3, rateDriftNmPerS2: 0, gain: 1, thicknessNm: 100, opticalThicknessNm: 200, indexSigma: 0.005, thicknessSigmaNm: 1, opticalThicknessSigmaNm: 2, rateSigma: 0, rateDriftSigma: 0, noiseCorrelation: 1 } as LayerEstimate);
  const held = { index: 0.003, thicknessNm: 0.8, opticalNm: 1.2 };
  const chained = { index: 0.001, thicknessNm: 0.2, opticalNm: 0.3 };

  it('σ² − held² + chained² where the σ is still the one the share went into', () => {
    const e = base();
    swapGainDriftShare(e, { held, chained, atFit: { index: 0.005, thicknessNm: 1, opticalNm: 2 } }, true);
    expect(e.thicknessSigmaNm).toBeCloseTo(Math.sqrt(1 - 0.64 + 0.04), 12);
    expect(e.opticalThicknessSigmaNm).toBeCloseTo(Math.sqrt(4 - 1.44 + 0.09), 12);
    expect(e.indexSigma).toBeCloseTo(Math.sqrt(0.005 ** 2 - 0.003 ** 2 + 0.001 ** 2), 12);
  });

  it('in proportion where later evidence narrowed the σ, and the index left alone where pooled', () => {
    const e = base();
    // the thickness σ halved since the fit (a growth read from the next layer): a quarter of each share left in it
    swapGainDriftShare(e, { held, chained, atFit: { index: 0.005, thicknessNm: 2, opticalNm: 2 } }, false);
    expect(e.thicknessSigmaNm).toBeCloseTo(Math.sqrt(1 - 0.25 * 0.64 + 0.25 * 0.04), 12);
    expect(e.indexSigma).toBe(0.005);
  });
});
