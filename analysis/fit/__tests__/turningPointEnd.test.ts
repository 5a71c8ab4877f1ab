import { describe, expect, it } from 'vitest';
import { type FitLayerData } from '../layerModel';
import { type LayerEstimate } from '../fitLayers';
import { turningPointEndS, turningPointEndsOnChip } from '../turningPointEnd';

// Transmittance at 600 nm of quarter-wave layers on glass: a layer's monitor signal turns where
// its n·d reaches λ/4 on a stack of quarter-waves (H. A. Macleod, Thin-Film Optical Filters,
// ch. 2; from memory): H (n = 2.3) at 65.217 nm, L (n = 1.46) on it at 102.740 nm.
const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: 600, mode: 'T' as const };
const qw = (n: number) => 600 / (4 * n);

function layer(index: number, durationS: number): FitLayerData {
  return {
    optics, nominalAt: () => ({ re: index, im: 0 }), tauS: new Float64Array([0, durationS]), y: new Float64Array(2), durationS, extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
}

function estimate(index: number, rateNmPerS: number, rateDriftNmPerS2 = 0): LayerEstimate {
  return { index, rateNmPerS, rateDriftNmPerS2, gain: 1 } as LayerEstimate;
}

describe("a turning-point cut's end from its fitted layer (no layer column)", () => {
  it('is the time the fitted thickness law reaches the modelled turning point, whichever side of it the placed end lies', () => {
    const below = [{ n: { re: 2.3, im: 0 }, thicknessNm: qw(2.3) }];
    // 0.5 nm/s: the turning point at 205.48 s; placed 5.5 s early, and 4 s late
    expect(turningPointEndS(layer(1.46, 200), estimate(1.46, 0.5), below)).toBeCloseTo(qw(1.46) / 0.5, 1);
    expect(turningPointEndS(layer(1.46, 209.5), estimate(1.46, 0.5), below)).toBeCloseTo(qw(1.46) / 0.5, 1);
    // with a rate drift: r·τ + a·τ²/2 = d
    const a = 0.0005, r = 0.45, d = qw(1.46);
    const tau = (-r + Math.sqrt(r * r + 2 * a * d)) / a;
    expect(turningPointEndS(layer(1.46, tau - 3), estimate(1.46, r, a), below)).toBeCloseTo(tau, 1);
  });

  it('follows the fitted index, not the design', () => {
    expect(turningPointEndS(layer(1.5, 200), estimate(1.5, 0.5), [])).toBeCloseTo(qw(1.5) / 0.5, 1);
  });

  it('has none where the fitted curve does not turn within 10 % of the placed thickness', () => {
    // placed at half a quarter-wave: the turning points lie at 0 and at a whole quarter-wave
    expect(turningPointEndS(layer(1.46, 102.7), estimate(1.46, 0.5), [])).toBeNull();
  });

  it('on a chip, places each end on the stack below as ended, bottom up, and says when any moved', () => {
    const data = [layer(2.3, 258), layer(1.46, 200)];
    const estimates = [estimate(2.3, 0.25), estimate(1.46, 0.5)];
    expect(turningPointEndsOnChip(data, estimates, [true, true])).toBe(true);
    expect(data[0].durationS).toBeCloseTo(qw(2.3) / 0.25, 1);
    expect(data[1].durationS).toBeCloseTo(qw(1.46) / 0.5, 1);
    // at the turning points already: nothing moves
    expect(turningPointEndsOnChip(data, estimates, [true, true])).toBe(false);
    // a level-cut layer is left as it is
    const level = [layer(2.3, 250)];
    expect(turningPointEndsOnChip(level, [estimates[0]], [false])).toBe(false);
    expect(level[0].durationS).toBe(250);
  });
});
