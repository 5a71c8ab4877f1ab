import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { indexAtMemo, type MaterialModel } from '../../materials';
import { fromNK, growingLayerSignal } from '../../optics';
import { createRng } from '../../synth';
import { wanderKnots, wanderThickness, type RateWander } from '../rateWander';
import { wanderErrorVariances, wanderVariancesFromRequest, wanderVariancesRequest } from '../wanderSigma';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };
const materials: MaterialModel[] = [{ model: 'constant', n: 2.1 }, { model: 'constant', n: 1.46 }];

/** Two layers of a chip (H on the glass, L on H), each grown with a wander drawn from its prior, jointly fitted with the plain law. */
function chip() {
  const rng = createRng(11);
  const tauS = Float64Array.from({ length: 401 }, (_, i) => i * 0.5);
  const rates = [0.3, 0.45], durationS = 200;
  const wanders: RateWander[] = rates.map((r) => ({ knotsS: wanderKnots(durationS, 20), sigmaNmPerS: 0.02 * r, correlationS: 20, pointSigma: 1 }));
  const ends: number[] = [];
  const data: FitLayerData[] = rates.map((r, j) => {
    const v = Float64Array.from(wanders[j].knotsS, () => rng.normal());
    const d = tauS.map((t) => r * t + wanderThickness(wanders[j], v, t));
    const below = j === 0 ? [] : [{ n: fromNK(2.1), thicknessNm: ends[0] }];
    ends.push(d[d.length - 1]);
    const y = growingLayerSignal({ ...optics, below, growing: fromNK([2.1, 1.46][j]) }, d).map((m) => 0.9 * m + 1e-4 * rng.normal());
    return { optics, nominalAt: indexAtMemo(materials[j]), tauS, y, durationS, extinction: 0, heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0 };
  });
  const joint = fitLayers({ fixedBelow: [], layers: data, start: rates.map((r, j) => ({ index: [2.1, 1.46][j], rateNmPerS: r, rateDriftNmPerS2: 0, gain: 0.9 })), offsetSignal: 0 });
  return { data, joint, wanders };
}

describe('a chip\'s wander variances as a request (made here or on the second thread)', () => {
  it('gives the same figures from a copy as another thread receives it, and what wanderErrorVariances gives on the fit', () => {
    const { data, joint, wanders } = chip();
    const direct = wanderErrorVariances([], data, joint, 0, wanders, null)!;
    const request = wanderVariancesRequest(data, materials, joint, 0, wanders, null)!;
    expect(() => structuredClone(request)).not.toThrow();
    const here = wanderVariancesFromRequest(request)!;
    const there = wanderVariancesFromRequest(structuredClone(request))!;
    // wherever it runs, bit for bit
    expect(there).toEqual(here);
    // and as on the live fit (its normal matrix factored before the first step there: the last bits may differ)
    expect(here).toHaveLength(2);
    here.forEach((v, j) => {
      expect(v.thicknessNm2).toBeGreaterThan(0);
      expect(Math.abs(v.thicknessNm2 / direct[j].thicknessNm2 - 1)).toBeLessThan(1e-9);
      expect(Math.abs(v.index / direct[j].index - 1)).toBeLessThan(1e-9);
    });
    // the request sends no function: the layers' index functions are rebuilt from their materials
    expect(request.layers.every((l) => !('nominalAt' in l))).toBe(true);
  });
});
