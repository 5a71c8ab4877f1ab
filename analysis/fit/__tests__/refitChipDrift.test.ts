import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { type SharedGain } from '../fitLayers';
import { refitChip, type LayerState } from '../analyzeRun';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };
const GAMMA = -2.8e-6; // −1 %/h

/** Two layers on one chip read through a gain 0.9·(1 + γ·t), γ known (each layer's gainDriftPerS), t from the first layer's start. */
function chip(): FitLayerData[] {
  const rng = createRng(5);
  const layers = [{ index: 2.1, rate: 0.3, durationS: 300, startS: 0 }, { index: 1.46, rate: 0.5, durationS: 200, startS: 1200 }];
  return layers.map((l, j) => {
    const n = Math.round(l.durationS / 0.5) + 1;
    const tauS = Float64Array.from({ length: n }, (_, i) => i * 0.5);
    const below = j === 0 ? [] : [{ n: fromNK(2.1), thicknessNm: 0.3 * 300 }];
    const m = growingLayerSignal({ ...optics, below, growing: fromNK(l.index) }, tauS.map((t) => l.rate * t));
    const y = m.map((v, i) => 0.9 * (1 + GAMMA * (l.startS + tauS[i])) * v + 0.0005 * rng.normal());
    return {
      optics, nominalAt: () => fromNK(l.index), tauS, y, durationS: tauS[n - 1], extinction: 0, heldIndex: null, fitDrift: false,
      heldGain: null, chipTimeS: l.startS, gainDriftPerS: GAMMA,
    };
  });
}

describe('refitChip: the chip-wide gain during the pass', () => {
  it('keeps a known drift the joint fit held (its result reports no fitted drift), so the next layer\'s held gain is G·(1 + γ·t)', () => {
    const data = chip();
    const start = [{ index: 2.1, rateNmPerS: 0.3, rateDriftNmPerS2: 0, gain: 0.9 }, { index: 1.46, rateNmPerS: 0.5, rateDriftNmPerS2: 0, gain: 0.9 }];
    const first = fitLayers({ fixedBelow: [], layers: data, start, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: GAMMA, fitDrift: false } });
    const states = first.layers.map((estimate) => ({ estimate })) as unknown as LayerState[];
    const chipGain: SharedGain = { gain: 0.9, driftPerS: GAMMA, fitDrift: false };
    refitChip(data, states, 0, false, chipGain);
    expect(chipGain.driftPerS).toBe(GAMMA);
    // The gain a third layer at t = 1500 s would hold: 0.9·(1 − 0.42 %), within the noise's reach of it.
    const held = chipGain.gain * (1 + chipGain.driftPerS * 1500);
    expect(Math.abs(held / (0.9 * (1 + GAMMA * 1500)) - 1)).toBeLessThan(3e-4);
  });

  it('takes the fitted drift when the fit fits it', () => {
    const data = chip();
    const start = [{ index: 2.1, rateNmPerS: 0.3, rateDriftNmPerS2: 0, gain: 0.9 }, { index: 1.46, rateNmPerS: 0.5, rateDriftNmPerS2: 0, gain: 0.9 }];
    const states = start.map((s) => ({ estimate: { ...s, indexSigma: 0, rateSigma: 0, rateDriftSigma: 0, gainSigma: 0 } })) as unknown as LayerState[];
    const chipGain: SharedGain = { gain: 0.9, driftPerS: 0, fitDrift: true };
    refitChip(data.map((d) => ({ ...d, gainDriftPerS: 0 })), states, 0, true, chipGain);
    expect(chipGain.driftPerS).not.toBe(0);
    expect(Math.abs(chipGain.driftPerS / GAMMA - 1)).toBeLessThan(0.3);
  });
});
