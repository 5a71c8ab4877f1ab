import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type JointFitInput, type MonitorOptics } from '..';
import { chiSquare95, driftCarried, driftsScatter, holdUncarriedDrifts, WHITE_RESIDUALS } from '../rateDriftChoice';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: true, wavelengthNm: 520, mode: 'T' };
const STEP_S = 0.5;

/**
 * A chip of two layers read through a gain 0.9, white noise 0.1 % of full scale: 120 nm of
 * n = 2.1 (cut on the slope) and 92 nm of n = 1.46 (1.03 QWOT at 520 nm: cut just past its
 * turning point, the end extrapolated). Each layer's rate changes by `drift[j]` (a fraction) over
 * the layer: d = r·τ + a·τ²/2 with a = drift·r/T. `correlated`: σ of an AR(1) noise added (5 s).
 */
function chip(seed: number, drift: [number, number], correlated = 0): { layers: FitLayerData[]; endsNm: number[] } {
  const rng = createRng(seed);
  // AR(1) noise of σ `correlated` with a 5 s correlation time, added to the white noise
  const rho = Math.exp(-STEP_S / 5);
  let ar = correlated * rng.normal();
  const plan = [{ index: 2.1, rate: 0.25, thicknessNm: 120 }, { index: 1.46, rate: 0.5, thicknessNm: 92 }];
  const below: { n: ReturnType<typeof fromNK>; thicknessNm: number }[] = [];
  let t0 = 0;
  const endsNm: number[] = [];
  const layers = plan.map((l, j) => {
    // the time at which d(T) reaches the layer's thickness under the drifting rate
    const T0 = l.thicknessNm / l.rate, a = (drift[j] * l.rate) / T0;
    const T = a === 0 ? T0 : (-l.rate + Math.sqrt(l.rate * l.rate + 2 * a * l.thicknessNm)) / a;
    const n = Math.floor(T / STEP_S) + 1;
    const tauS = Float64Array.from({ length: n }, (_, i) => i * STEP_S);
    const d = tauS.map((t) => l.rate * t + 0.5 * a * t * t);
    const m = growingLayerSignal({ ...optics, below: [...below], growing: fromNK(l.index) }, d);
    const end = d[n - 1];
    below.push({ n: fromNK(l.index), thicknessNm: end });
    endsNm.push(end);
    const y = m.map((v) => {
      ar = rho * ar + correlated * Math.sqrt(1 - rho * rho) * rng.normal();
      return 0.9 * v + ar + 0.001 * rng.normal();
    });
    const data: FitLayerData = {
      optics, nominalAt: () => fromNK(l.index), tauS, y, durationS: tauS[n - 1], extinction: 0, heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: t0,
    };
    t0 += tauS[n - 1] + 3;
    return data;
  });
  return { layers, endsNm };
}

function input(layers: FitLayerData[]): JointFitInput {
  return {
    fixedBelow: [], layers, offsetSignal: 0, sharedGain: { gain: 0.9, driftPerS: 0, fitDrift: false },
    start: [{ index: 2.1, rateNmPerS: 0.25, rateDriftNmPerS2: 0, gain: 0.9 }, { index: 1.46, rateNmPerS: 0.5, rateDriftNmPerS2: 0, gain: 0.9 }],
  };
}

describe('the 95 % point of χ² (Wilson–Hilferty)', () => {
  it('matches the tabled values within 3 % at ν = 1 and 0.5 % from ν = 5', () => {
    // Upper 5 % critical values of χ², NIST/SEMATECH e-Handbook of Statistical Methods,
    // §1.3.6.7.4 (from memory): 3.841, 5.991, 11.070, 18.307, 43.773.
    const table: [number, number, number][] = [[1, 3.841, 0.03], [2, 5.991, 0.01], [5, 11.07, 0.005], [10, 18.307, 0.005], [30, 43.773, 0.005]];
    for (const [nu, value, tol] of table) expect(Math.abs(chiSquare95(nu) / value - 1)).toBeLessThan(tol);
  });
});

describe('whether a drift is carried, and whether the drifts scatter', () => {
  const estimate = (a: number, sigma: number) => ({ rateDriftNmPerS2: a, rateDriftSigma: sigma }) as Parameters<typeof driftCarried>[0];
  it('a drift is carried where (a/σ)² exceeds ln N', () => {
    // ln 400 = 5.99: 2.4σ is not carried, 2.5σ is
    expect(driftCarried(estimate(2.4e-5, 1e-5), 400)).toBe(false);
    expect(driftCarried(estimate(-2.5e-5, 1e-5), 400)).toBe(true);
    expect(driftCarried(estimate(1e-5, 0), 400)).toBe(true);
  });
  it('drifts scatter where Cochran\'s Q exceeds the χ² 95 % point', () => {
    // Q = 0.5 and 18 on 2 degrees of freedom (95 % point 5.99)
    expect(driftsScatter([{ g: 0, sigma: 1 }, { g: 0.5, sigma: 1 }, { g: -0.5, sigma: 1 }])).toBe(false);
    expect(driftsScatter([{ g: 3, sigma: 1 }, { g: -3, sigma: 1 }, { g: 0, sigma: 1 }])).toBe(true);
    // unequal σ, 1 degree of freedom (3.84): about the weighted mean 0.8, Q = 4·0.04 + 1·0.64 = 0.8;
    // about 2.4, Q = 4·0.36 + 1·5.76 = 7.2
    expect(driftsScatter([{ g: 1, sigma: 0.5 }, { g: 0, sigma: 1 }])).toBe(false);
    expect(driftsScatter([{ g: 3, sigma: 0.5 }, { g: 0, sigma: 1 }])).toBe(true);
    expect(driftsScatter([{ g: 3, sigma: 1 }])).toBe(false);
  });
});

describe('a rate drift the data do not carry, held at 0 in a chip\'s joint fit', () => {
  it('a steady rate, white noise: the layer cut past its turning point ends closer to the truth, with the free fit\'s σ', { timeout: 120_000 }, () => {
    let freeSq = 0, heldSq = 0, heldCount = 0;
    const seeds = Array.from({ length: 12 }, (_, i) => i + 1);
    for (const seed of seeds) {
      const { layers, endsNm } = chip(seed, [0, 0]);
      const free = fitLayers(input(layers));
      const choice = holdUncarriedDrifts(input(layers), free);
      if (choice.held.includes(1)) heldCount++;
      freeSq += (free.layers[1].thicknessNm - endsNm[1]) ** 2;
      heldSq += (choice.result.layers[1].thicknessNm - endsNm[1]) ** 2;
      for (const j of choice.held) expect(choice.layers[j].fitDrift).toBe(false);
      choice.result.layers.forEach((e, j) => expect(e.thicknessSigmaNm).toBe(free.layers[j].thicknessSigmaNm));
    }
    const rms = (s: number) => Math.sqrt(s / seeds.length);
    console.log(`steady rate: layer 2 end RMS error ${rms(freeSq).toFixed(3)} nm free, ${rms(heldSq).toFixed(3)} nm held; held on ${heldCount} of ${seeds.length} seeds`);
    expect(heldCount).toBeGreaterThanOrEqual(0.75 * seeds.length);
    expect(rms(heldSq)).toBeLessThan(0.8 * rms(freeSq));
  });

  it('a rate that drifts 20 % over each layer: the drifts are carried and stay free', { timeout: 120_000 }, () => {
    for (const seed of [1, 2, 3]) {
      const { layers } = chip(seed, [0.2, 0.2]);
      const free = fitLayers(input(layers));
      expect(holdUncarriedDrifts(input(layers), free).held).toEqual([]);
    }
  });

  it('drifts that differ from layer to layer beyond their noise: none is held', { timeout: 120_000 }, () => {
    // the first layer's drift is plain in its data; the second's, opposite and small, is not
    for (const seed of [1, 2, 3]) {
      const { layers } = chip(seed, [-0.2, 0.01]);
      const free = fitLayers(input(layers));
      expect(driftCarried(free.layers[1], layers[1].tauS.length)).toBe(false);
      expect(holdUncarriedDrifts(input(layers), free).held).toEqual([]);
    }
  });

  it('correlated residuals (a slow disturbance on the readings): none is held', { timeout: 120_000 }, () => {
    for (const seed of [1, 2, 3]) {
      const { layers } = chip(seed, [0, 0], 0.002);
      const free = fitLayers(input(layers));
      expect(free.layers.every((e) => e.noiseCorrelation >= WHITE_RESIDUALS)).toBe(true);
      expect(holdUncarriedDrifts(input(layers), free).held).toEqual([]);
    }
  });
});
