import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { layerSpectrum } from '../layerSpectrum';
import { synthTrace } from './scenarios';

/** One thick TiO2 layer (4 QWOT at 600 nm, two fringes) on fused silica, cut on level. */
function thickLayer() {
  return parseDesign({
    format: 'fringelog.design/1', name: 'thick H', referenceWavelengthNm: 600, substrate: 'fused-silica', substrateBackside: true,
    materials: { H: 'TiO2' }, layers: [{ material: 'H', qwot: 4, monitor: { wavelengthNm: 600, mode: 'T', chip: 1, cut: 'level' } }],
  });
}

describe('layer spectrum: fringe rate and periodic disturbances', () => {
  it('turns the fringe frequency into a rate by f·λ/(2n) (one fringe per half-wave; Macleod, Thin-Film Optical Filters, ch. 2)', () => {
    // a pure fringe of period λ/(2n) = 600/(2·2.3) nm at 0.25 nm/s
    const rate = 0.25, n = 2.3, wl = 600;
    const tauS = Float64Array.from({ length: 20000 }, (_, i) => i * 0.1);
    const y = Float64Array.from(tauS, (t) => 0.8 + 0.1 * Math.cos((2 * Math.PI * rate * t) / (wl / (2 * n))));
    const s = layerSpectrum(tauS, y, wl, n);
    expect(s.fringeRateNmPerS! / rate - 1).toBeLessThan(0.01);
    expect(layerSpectrum(tauS.subarray(0, 20), y.subarray(0, 20), wl, n).fringeRateNmPerS).toBeNull();
  });

  it('recovers a layer cut 80 % thick, beyond the design-rate start grid, and reports a holder wobble', async () => {
    const design = thickLayer();
    const { run, trace } = await synthTrace(design, {
      seed: 5, rateNmPerS: { H: 0.25 }, overshoot: { 1: 0.8 }, ripple: { frequencyHz: 0.7, fraction: 0.004 }, thicknessScatter: 0,
    });
    // the layer's own spectrum: the run-wide line is not divided out first (option rippleDivide)
    const result = await analyzeRun(design, trace, { rippleDivide: false });
    const layer = result.layers[0];
    const truth = run.truth[0];
    expect(Math.abs(layer.thicknessNm / truth.thicknessNm - 1)).toBeLessThan(0.003);
    expect(Math.abs(layer.fringeRateNmPerS! / truth.rateNmPerS - 1)).toBeLessThan(0.05);
    expect(layer.disturbances.some((d) => Math.abs(d.frequencyHz - 0.7) < 0.01)).toBe(true);
    expect(layer.warnings.some((w) => w.startsWith('periodic disturbance at 0.70'))).toBe(true);
  });

  it('reports no disturbance on a clean layer', async () => {
    const design = thickLayer();
    const { trace } = await synthTrace(design, { seed: 6, rateNmPerS: { H: 0.25 }, thicknessScatter: 0 });
    expect((await analyzeRun(design, trace)).layers[0].disturbances).toEqual([]);
  });
});

describe('layer spectrum on a part-fringe layer', () => {
  it('gives no fringe rate for a quarter-wave (half a fringe) plus noise', () => {
    const wl = 600, n = 2.3, rate = 0.25;
    const tauS = Float64Array.from({ length: 2600 }, (_, i) => i * 0.1);
    let seed = 7;
    const noise = () => ((seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5) * 0.002;
    const y = Float64Array.from(tauS, (t) => 0.8 + 0.1 * Math.cos((2 * Math.PI * rate * t) / (wl / (2 * n))) + noise());
    expect(layerSpectrum(tauS, y, wl, n).fringeRateNmPerS).toBeNull();
  });
});
