import { describe, expect, it } from 'vitest';
import { stackRT } from '@/tests/chamber/thinFilm';
import { gaussian } from '../../trace/__tests__/rng';
import { fitLayers } from '../fitLayers';
import { growthFromNext } from '../growthFromNext';
import { type FitLayerData } from '../layerModel';
import { binMeans } from '../subsample';

// An H quarter-wave (n = 2.3) cut at its turning point, δ more grown while the shutter closed,
// then an L layer (n = 1.46) at 0.5 nm/s for about a quarter-wave: transmittance at 600 nm
// from the chamber simulator's own matrices (tests/chamber/thinFilm.ts), not ours. A quarter-wave
// is n·d = λ/4, where the monitor's transmittance turns (H. A. Macleod, Thin-Film Optical
// Filters, ch. 2; from memory).
const media = { ambient: 1, substrate: 1.52, backside: true };
const dH = 600 / (4 * 2.3);
const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: 600, mode: 'T' as const };

function nextLayer(deltaNm: number, seed: number, sigma = 0.0005) {
  const g = gaussian(seed), rate = 0.5, dt = 0.1, n = 2055;
  const tau = Float64Array.from({ length: n }, (_, i) => i * dt);
  const y = Float64Array.from(tau, (t) => stackRT([{ n: 2.3, k: 0, thicknessNm: dH + deltaNm }, { n: 1.46, k: 0, thicknessNm: rate * t }], 600, media).T + sigma * g());
  const binned = binMeans(tau, Int32Array.from(tau, (_, i) => i), y, 400);
  const data: FitLayerData = {
    optics, nominalAt: () => ({ re: 1.46, im: 0 }), tauS: binned.tauS, y: binned.y, durationS: tau[n - 1], extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
  // The stack below as the layer's own fit would leave it: the H layer at its logged end, without δ.
  const below = [{ n: { re: 2.3, im: 0 }, thicknessNm: dH }];
  const fit = fitLayers({ fixedBelow: below, layers: [data], start: [{ index: 1.46, rateNmPerS: 0.5, rateDriftNmPerS2: 0, gain: 1 }], offsetSignal: 0 });
  return growthFromNext({
    below, layer: data, params: fit.solver.params, offsetSignal: 0, gainPriorWeight: 0,
    residualVariance: fit.solver.ssr / fit.solver.dof, noiseCorrelation: fit.layers[0].noiseCorrelation,
  })!;
}

describe('the growth of the layer below, from where a layer starts on its fringe', () => {
  it('finds the thickness grown after a turning-point cut, to first order, within its σ', () => {
    const z: number[] = [];
    for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
      const g = nextLayer(0.2, seed);
      expect(g.sigmaNm).toBeLessThan(0.15);
      z.push((g.deltaNm - 0.2) / g.sigmaNm);
    }
    for (const v of z) expect(Math.abs(v)).toBeLessThan(3);
    // The σ is honest: the scatter of the errors over the seeds is about 1σ.
    const rms = Math.sqrt(z.reduce((a, v) => a + v * v, 0) / z.length);
    expect(rms).toBeGreaterThan(0.4);
    expect(rms).toBeLessThan(1.8);
  });

  it('finds none where none grew, and the exact value without noise', () => {
    expect(Math.abs(nextLayer(0, 9).deltaNm)).toBeLessThan(3 * nextLayer(0, 9).sigmaNm);
    expect(nextLayer(0.3, 10, 0).deltaNm).toBeCloseTo(0.3, 2);
  });

  it('has nothing to say without a layer below', () => {
    const g = gaussian(1);
    const tau = Float64Array.from({ length: 50 }, (_, i) => i);
    const data: FitLayerData = {
      optics, nominalAt: () => ({ re: 1.46, im: 0 }), tauS: tau, y: Float64Array.from(tau, () => 0.9 + 0.001 * g()), durationS: 49, extinction: 0,
      heldIndex: null, fitDrift: false, heldGain: null, chipTimeS: 0,
    };
    expect(growthFromNext({ below: [], layer: data, params: [1.46, 0.5, 1], offsetSignal: 0, gainPriorWeight: 0, residualVariance: 1e-6, noiseCorrelation: 1 })).toBeNull();
  });
});
