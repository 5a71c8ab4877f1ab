import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { parseDesign } from '../../design';
import { bbar4, mirror18, synthTrace } from './scenarios';

const single = parseDesign({
  format: 'fringelog.design/1', name: 'single H', referenceWavelengthNm: 550, substrate: 'crown-glass-1.52', substrateBackside: true,
  materials: { H: 'Ta2O5' }, layers: [{ material: 'H', qwot: 2, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } }],
});

describe('analyzeRun on faulty runs', () => {
  it('reports an overshoot cut: its cut error, a warning, and an ideal cut time before the actual one', async () => {
    const { run, trace } = await synthTrace(single, { seed: 31, overshoot: { 1: 0.05 }, thicknessScatter: 0 });
    const [l] = (await analyzeRun(single, trace)).layers;
    expect(l.cutErrorQwotPct).toBeCloseTo(run.truth[0].cutErrorQwotPct, 0);
    expect(l.cutErrorQwotPct).toBeGreaterThan(8); // 5 % of a 2-QWOT layer is 10 % of one quarter-wave
    expect(l.warnings.some((w) => w.startsWith('cut thick (overshoot)'))).toBe(true);
    expect(l.idealCutTimeS!).toBeLessThan(l.cutTimeS - 5);
    expect(l.lastTurningPoint?.kind).toBe('max'); // after 2 QWOT of H on glass the transmittance is back at the bare level
    expect(l.lastTurningPoint!.timeS).toBeCloseTo(l.idealCutTimeS!, 6);
    // …and the data show the same extrema: a minimum at 1 QWOT, then the maximum at 2
    expect(l.observedTurningPoints).toBe(2);
    expect(l.lastObservedTurningPoint!.kind).toBe('max');
    expect(Math.abs(l.lastObservedTurningPoint!.timeS - l.lastTurningPoint!.timeS)).toBeLessThan(3);
  });

  it('flags a rate spike by its residuals (refit), on that layer only', async () => {
    const design = mirror18();
    const { trace } = await synthTrace(design, { seed: 32, rateSpikes: [{ layer: 4, atFraction: 0.5, durationS: 15, factor: 2 }] });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    // Flagged by its residuals, or (where the wandering-rate model follows the spike) by the rate's departure.
    const spike = (w: string) => w.startsWith('residuals') || w.startsWith('the rate departs');
    const flagged = result.layers.filter((l) => l.warnings.some(spike)).map((l) => l.layer);
    expect(flagged).toEqual([4]);
    expect(result.warnings.some((w) => w.startsWith('layer 4: ') && spike(w.slice('layer 4: '.length)))).toBe(true);
  });

  it('takes the offset from dark samples and checks the tooling factor against crystal_nm', async () => {
    const design = bbar4();
    const { trace } = await synthTrace(design, { seed: 33, gain: 1.9, offset: 0.03, darkS: 15, tooling: { H: 1.06, L: 0.97 } });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    expect(result.chips[0].darkSamples).toBe(150);
    expect(result.chips[0].offset).toBeCloseTo(0.03, 3);
    expect(result.chips[0].gain).toBeCloseTo(1.9, 2);
    const byMaterial = Object.fromEntries(result.tooling.map((t) => [t.material, t.meanRatio]));
    expect(byMaterial.H).toBeCloseTo(1.06, 2);
    expect(byMaterial.L).toBeCloseTo(0.97, 2);
  });

  it('calibrates each chip from its own bare stretch after a chip change', async () => {
    const design = mirror18();
    const { trace } = await synthTrace(design, { seed: 34, gain: 1.3 });
    const result = await analyzeRun(design, trace);
    expect(result.chips.map((c) => [c.chip, c.source])).toEqual([[1, 'bare-chip'], [2, 'bare-chip'], [3, 'bare-chip']]);
    for (const c of result.chips) expect(c.gain).toBeCloseTo(1.3, 2);
  });

  it('estimates a detector gain drift from the bare-chip calibrations of successive chips and corrects for it', { timeout: 120_000 }, async () => {
    const design = mirror18();
    const { run, trace } = await synthTrace(design, { seed: 35, gainDriftPerHour: -0.03, rateNmPerS: { H: 0.25, L: 0.5 } });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    const note = result.warnings.find((w) => w.startsWith('detector gain drifting'));
    expect(note).toMatch(/^detector gain drifting -(2\.[6-9]|3\.[0-4])\d % per hour \(from the bare-chip calibrations of 3 chips\)/);
    for (const l of result.layers) {
      const t = run.truth[l.layer - 1];
      expect(Math.abs(l.thicknessNm / t.thicknessNm - 1), `layer ${l.layer} thickness`).toBeLessThan(0.003);
      expect(Math.abs(l.index - t.index), `layer ${l.layer} index`).toBeLessThan(0.003);
    }
    const without = await analyzeRun(design, trace, { mode: 'refit', gainDriftFromChips: false });
    const worst = (r: typeof result) => Math.max(...r.layers.map((l) => Math.abs(l.index - run.truth[l.layer - 1].index)));
    expect(worst(without)).toBeGreaterThan(2 * worst(result));
  });

  it('joins the two runs of a paused layer, leaving the pause out of its time base', async () => {
    const design = mirror18();
    const { run, trace } = await synthTrace(design, { seed: 39, pauses: [{ layer: 5, atFraction: 0.5, durationS: 30 }] });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    const l5 = result.layers[4];
    expect(l5.warnings).toContain('the layer was deposited in 2 runs; the pauses are left out of its time base');
    expect(result.warnings.some((w) => w.includes('layer 5 resumes after a pause'))).toBe(true);
    expect(l5.cutTimeS).toBeCloseTo(run.truth[4].endTimeS, 6);
    expect(Math.abs(l5.thicknessNm / run.truth[4].thicknessNm - 1)).toBeLessThan(0.003);
    expect(Math.abs(l5.index - run.truth[4].index)).toBeLessThan(0.003);
  });

  it('handles reflectance monitoring, an absorbing material and a change of monitor wavelength on one chip (refit)', async () => {
    const layers = Array.from({ length: 8 }, (_, i) => ({
      material: i % 2 ? 'L' : 'H', qwot: i === 3 ? 1.6 : 1,
      monitor: { wavelengthNm: i < 4 ? 600 : 700, mode: 'R', chip: 1, cut: i === 3 ? 'level' : 'turning-point' },
    }));
    const design = parseDesign({
      format: 'fringelog.design/1', name: 'R monitor', referenceWavelengthNm: 600, substrate: { model: 'constant', n: 1.52 }, substrateBackside: false,
      materials: { H: { model: 'constant', n: 2.2, k: 0.002 }, L: 'SiO2' }, layers,
    });
    const { run, trace } = await synthTrace(design, { seed: 5, rateDriftFraction: 0.03 });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    for (const l of result.layers) {
      const t = run.truth[l.layer - 1];
      expect(Math.abs(l.thicknessNm - t.thicknessNm), `layer ${l.layer} thickness`).toBeLessThan(Math.max(0.003 * t.thicknessNm, 3 * l.thicknessSigmaNm));
      expect(Math.abs(l.index - t.index), `layer ${l.layer} index`).toBeLessThan(Math.max(0.003, 3 * l.indexSigma));
      expect(l.mode).toBe('R');
    }
    expect(result.layers[4].wavelengthNm).toBe(700);
  });

  it('tracks index drift per material with a trend and its σ', async () => {
    const design = mirror18();
    const { run, trace } = await synthTrace(design, { seed: 36, indexDriftPerHour: { H: -0.03 } });
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    const h = result.indexDrift.find((d) => d.material === 'H')!;
    const l = result.indexDrift.find((d) => d.material === 'L')!;
    const hours = (run.truth[17].startTimeS - run.truth[0].startTimeS) / 3600;
    expect(hours).toBeGreaterThan(1);
    expect(h.byTime.slope).toBeCloseTo(-0.03, 2);
    expect(Math.abs(h.byTime.slope + 0.03)).toBeLessThan(3 * h.byTime.slopeSigma + 0.002);
    expect(Math.abs(l.byTime.slope)).toBeLessThan(3 * l.byTime.slopeSigma + 0.001);
  });

  it('analyzes a trace without a layer column: segments inferred, merged and refined against the design', async () => {
    const design = bbar4();
    const { run, trace } = await synthTrace(design, { seed: 38, settleS: 45, bareChipS: 45, layerColumn: false, chipColumn: false });
    expect(trace.layer).toBeNull();
    const result = await analyzeRun(design, trace, { mode: 'refit' });
    expect(result.segmentsInferred).toBe(true);
    expect(result.warnings.some((w) => w.includes('no layer column'))).toBe(true);
    expect(result.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
    for (const l of result.layers) {
      const t = run.truth[l.layer - 1];
      expect(Math.abs(l.startTimeS - t.startTimeS), `layer ${l.layer} start`).toBeLessThan(3);
      // Layer 4 ends on a level just past a turning point, where the signal is flat: its inferred
      // end (and so its thickness) is uncertain by several seconds of growth. Not checked here.
      if (l.layer < 4) expect(Math.abs((l.index * l.thicknessNm) / (t.index * t.thicknessNm) - 1), `layer ${l.layer} optical thickness`).toBeLessThan(0.015);
    }
  });

  it('returns the FORMATS.md keys, the as-built spectrum, and progress as it goes', async () => {
    const design = bbar4();
    const { trace } = await synthTrace(design, { seed: 37, noiseFraction: 0.0002, thicknessScatter: 0, rateScatter: 0 });
    const progress: [number, number][] = [];
    const result = await analyzeRun(design, trace, { onProgress: (d, n) => progress.push([d, n]) });
    expect(progress).toEqual([[1, 4], [2, 4], [3, 4], [4, 4]]);
    expect(result.format).toBe('fringelog.analysis/1');
    for (const key of ['layer', 'material', 'thicknessNm', 'thicknessSigmaNm', 'index', 'indexSigma', 'rateNmPerS', 'cutErrorQwotPct', 'residualRms']) {
      expect(result.layers[0]).toHaveProperty(key);
    }
    const { asBuiltR, designR } = result.spectrum;
    let worst = 0;
    for (let i = 0; i < designR.length; i++) worst = Math.max(worst, Math.abs(asBuiltR[i] - designR[i]));
    expect(worst).toBeLessThan(0.002); // a run on target builds the design
    expect(result.segmentsInferred).toBe(false);
  });
});
