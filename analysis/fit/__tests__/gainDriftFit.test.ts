import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };

/** Two layers on one chip read through a gain G·(1 + γ·t), t from the first layer's start, white noise σ. */
function chip(gamma: number, noise: number, seed: number): FitLayerData[] {
  const rng = createRng(seed);
  const layers = [{ index: 2.1, rate: 0.3, durationS: 300, startS: 0 }, { index: 1.46, rate: 0.5, durationS: 200, startS: 305 }];
  return layers.map((l, j) => {
    const n = Math.round(l.durationS / 0.5) + 1;
    const tauS = Float64Array.from({ length: n }, (_, i) => i * 0.5);
    const below = j === 0 ? [] : [{ n: fromNK(2.1), thicknessNm: 0.3 * 300 }];
    const m = growingLayerSignal({ ...optics, below, growing: fromNK(l.index) }, tauS.map((t) => l.rate * t));
    const y = m.map((v, i) => 0.9 * (1 + gamma * (l.startS + tauS[i])) * v + noise * rng.normal());
    return {
      optics, nominalAt: () => fromNK(l.index), tauS, y, durationS: tauS[n - 1], extinction: 0, heldIndex: null, fitDrift: false, heldGain: null, chipTimeS: l.startS,
    };
  });
}

const start = [{ index: 2.1, rateNmPerS: 0.3, rateDriftNmPerS2: 0, gain: 0.9 }, { index: 1.46, rateNmPerS: 0.5, rateDriftNmPerS2: 0, gain: 0.9 }];

describe('fitLayers: a chip-wide gain drift under a Gaussian prior', () => {
  it('combines the data and the prior as two Gaussians: precisions add, the mean is precision-weighted (Bishop, PRML (2006), eqs. 2.113–2.117)', () => {
    // Near the solution the model is linear in γ, so the MAP estimate and its σ are those of the
    // product of the free fit's Gaussian N(γ̂, σ̂²) and the prior N(γ₀, σ₀²).
    const data = chip(-1e-5, 0.002, 3);
    const free = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: 0, fitDrift: true } });
    const g = free.sharedGain!.driftPerS, s = free.sharedGain!.driftSigmaPerS;
    expect(Math.abs(g - -1e-5)).toBeLessThan(3 * s);
    const map = (g0: number, s0: number) =>
      fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: g0, fitDrift: true, driftPrior: { meanPerS: g0, sigmaPerS: s0 } } }).sharedGain!;
    // A prior centred on the data's own estimate: the solution and its residuals stay, and only the precision adds.
    for (const s0 of [s, 0.5 * s, 3 * s]) {
      const m = map(g, s0);
      expect(m.driftSigmaPerS * Math.sqrt(1 / s ** 2 + 1 / s0 ** 2)).toBeCloseTo(1, 2);
      expect(Math.abs(m.driftPerS - g)).toBeLessThan(0.01 * s);
    }
    // A prior elsewhere (up to 4σ̂ away): the precision-weighted mean. Pulled off the data's optimum
    // the model is no longer quite linear in γ and its residuals read as slightly correlated noise
    // (the σ's inflation for it, fitLayers), so the check allows 0.15σ̂ in the mean and 10 % in σ
    // (measured: up to 0.09σ̂ and 6 %).
    for (const [g0, s0] of [[0, s], [g - 1.5 * s, 0.5 * s], [g + 2 * s, 3 * s], [2e-5, 3 * s]]) {
      const m = map(g0, s0);
      const a = 1 / s ** 2, b = 1 / s0 ** 2;
      expect(Math.abs(m.driftPerS - (a * g + b * g0) / (a + b))).toBeLessThan(0.15 * s);
      expect(Math.abs(m.driftSigmaPerS * Math.sqrt(a + b) - 1)).toBeLessThan(0.1);
    }
  });

  it('holds γ at the prior mean when the prior is far narrower than the data, and leaves the free fit when far wider', () => {
    const data = chip(-1e-5, 0.002, 4);
    const free = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: 0, fitDrift: true } });
    const s = free.sharedGain!.driftSigmaPerS;
    const narrow = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: 0, fitDrift: true, driftPrior: { meanPerS: 0, sigmaPerS: 1e-4 * s } } });
    expect(Math.abs(narrow.sharedGain!.driftPerS)).toBeLessThan(1e-3 * s);
    const wide = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: 0, fitDrift: true, driftPrior: { meanPerS: 0, sigmaPerS: 1e4 * s } } });
    expect(Math.abs(wide.sharedGain!.driftPerS - free.sharedGain!.driftPerS)).toBeLessThan(1e-3 * s);
  });
});
