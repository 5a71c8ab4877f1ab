import { describe, expect, it } from 'vitest';
import { createRng, synthesizeRun, traceCsv, traceCsvChunks } from '..';
import { parseDesign } from '../../design';
import { dispersion, type ChamberMaterial } from '@/tests/chamber/design';
import { stackRT } from '@/tests/chamber/thinFilm';
import { readTrace, readTraceText } from '../../trace';

const design = parseDesign({
  format: 'fringelog.design/1', name: 'synth test', referenceWavelengthNm: 550, substrate: 'crown-glass-1.52', substrateBackside: true,
  materials: { H: 'Ta2O5', L: 'SiO2' },
  layers: [
    { material: 'H', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
    { material: 'L', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
    { material: 'H', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 2, cut: 'turning-point' } },
  ],
});

describe('createRng', () => {
  it('is deterministic and gives standard normals', () => {
    const a = createRng(7), b = createRng(7);
    expect(Array.from({ length: 5 }, a.uniform)).toEqual(Array.from({ length: 5 }, b.uniform));
    const r = createRng(3);
    const v = Array.from({ length: 20000 }, r.normal);
    const mean = v.reduce((s, x) => s + x, 0) / v.length;
    const sd = Math.sqrt(v.reduce((s, x) => s + (x - mean) ** 2, 0) / v.length);
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(sd - 1)).toBeLessThan(0.02);
  });
});

describe('synthesizeRun', () => {
  it('is deterministic for a seed and different for another', () => {
    expect(traceCsv(synthesizeRun(design, { seed: 5 }))).toBe(traceCsv(synthesizeRun(design, { seed: 5 })));
    expect(traceCsv(synthesizeRun(design, { seed: 6 }))).not.toBe(traceCsv(synthesizeRun(design, { seed: 5 })));
  });

  it('follows the true stack\'s response, evaluated by the chamber simulator\'s own optics (tests/chamber: no code shared with analysis/)', () => {
    const run = synthesizeRun(design, { seed: 1, noiseFraction: 0, gain: 0.9, thicknessScatter: 0.01, indexOffset: { H: 0.01 } });
    const media = { ambient: 1, substrate: dispersion(design.substrate as ChamberMaterial, 550).n, backside: true };
    const truthT = (upTo: number, chip: number) => {
      const layers = run.truth.filter((b) => b.chip === chip && b.layer <= upTo).map((b) => ({ n: b.index, k: 0, thicknessNm: b.thicknessNm }));
      return stackRT(layers, 550, media).T;
    };
    for (const t of run.truth) {
      const end = run.layer.lastIndexOf(t.layer);
      expect(run.signal[end] / 0.9).toBeCloseTo(truthT(t.layer, t.chip), 10);
      expect(t.index).toBeCloseTo(dispersion(design.materials[t.material] as ChamberMaterial, 550).n + (t.material === 'H' ? 0.01 : 0), 12);
    }
    // a new chip starts bare: the idle stretch before layer 3 reads the bare chip (2n/(n² + 1), Macleod ch. 2)
    const firstOf3 = run.layer.indexOf(3);
    expect(run.signal[firstOf3 - 1] / 0.9).toBeCloseTo(truthT(0, 2), 10);
    expect(run.signal[firstOf3 - 1] / 0.9).toBeCloseTo((2 * 1.52) / (1.52 ** 2 + 1), 10);
    expect(run.chip[firstOf3 - 1]).toBe(2);
  });

  it('adds Gaussian noise of the requested σ, dark samples at the offset, gain drift and a crystal column', () => {
    const run = synthesizeRun(design, { seed: 2, noiseFraction: 0.002, gain: 2, offset: 0.05, darkS: 10, gainDriftPerHour: 0.1, tooling: { H: 1.1, L: 0.9 } });
    const dark = Array.from(run.signal.subarray(0, 100));
    const mean = dark.reduce((a, b) => a + b, 0) / dark.length;
    const sd = Math.sqrt(dark.reduce((a, b) => a + (b - mean) ** 2, 0) / (dark.length - 1));
    expect(mean).toBeCloseTo(0.05, 2);
    expect(sd / 0.004).toBeGreaterThan(0.8);
    expect(sd / 0.004).toBeLessThan(1.2);
    const t2 = run.truth[1];
    expect(t2.gain).toBeCloseTo(2 * (1 + (0.1 * t2.startTimeS) / 3600), 12);
    const end = run.layer.lastIndexOf(1);
    expect(run.crystalNm![end]).toBeCloseTo(run.truth[0].thicknessNm / 1.1, 10);
  });

  it('applies an overshoot and a rate spike to the truth', () => {
    const plain = synthesizeRun(design, { seed: 4, thicknessScatter: 0 });
    const faulty = synthesizeRun(design, { seed: 4, thicknessScatter: 0, overshoot: { 2: 0.05 }, rateSpikes: [{ layer: 1, atFraction: 0.3, durationS: 20, factor: 2 }] });
    expect(faulty.truth[1].thicknessNm / design.layers[1].thicknessNm).toBeCloseTo(1.05, 2);
    expect(faulty.truth[0].endTimeS - faulty.truth[0].startTimeS).toBeLessThan(plain.truth[0].endTimeS - plain.truth[0].startTimeS - 15);
  });

  it('cuts a turning-point layer at or past its true turning point, by no more than the overshoot (chamber simulator\'s optics)', () => {
    // A turning-point controller cuts once it has seen the signal turn: never before the turning
    // point of the true stack, whatever the index and the layers below.
    const media = { ambient: 1, substrate: dispersion(design.substrate as ChamberMaterial, 550).n, backside: true };
    for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
      const run = synthesizeRun(design, { seed, noiseFraction: 0, indexOffset: { H: 0.02, L: -0.01 } });
      for (const t of run.truth) {
        const below = run.truth.filter((b) => b.chip === t.chip && b.layer < t.layer).map((b) => ({ n: b.index, k: 0, thicknessNm: b.thicknessNm }));
        const T = (d: number) => stackRT([...below, { n: t.index, k: 0, thicknessNm: d }], 550, media).T;
        // the true turning point: the extreme of T over the last 3 % of the layer, on a 0.001 % grid
        let tp = t.thicknessNm, best = T(tp);
        const sign = T(t.thicknessNm * 0.97) < best ? 1 : -1;
        for (let f = 0.97; f <= 1; f += 1e-5) {
          const v = T(t.thicknessNm * f);
          if (sign * (v - best) > 0) [best, tp] = [v, t.thicknessNm * f];
        }
        const overshootPct = (t.thicknessNm / tp - 1) * 100;
        expect(overshootPct, `seed ${seed} layer ${t.layer}`).toBeGreaterThanOrEqual(0.1 - 0.01);
        // the default overshoot's top, 0.6 %, plus one sample's growth (0.1 s at ~0.3 nm/s on ~60–95 nm)
        expect(overshootPct, `seed ${seed} layer ${t.layer}`).toBeLessThan(0.6 + 0.06);
      }
    }
  });

  it('writes trace CSV that the trace reader accepts, with or without layer and chip columns', async () => {
    const run = synthesizeRun(design, { seed: 3, meta: { chamber: 'Bay 2 IAD' } });
    const trace = await readTrace(traceCsvChunks(run, { rowsPerChunk: 777 }), { fileName: 'synth.csv' });
    expect(trace.rowCount).toBe(run.timeS.length);
    expect(trace.meta.chamber).toBe('Bay 2 IAD');
    expect(Array.from(trace.layer!.subarray(0, 5))).toEqual([0, 0, 0, 0, 0]);
    expect(trace.signal[1000]).toBeCloseTo(run.signal[1000], 6);
    const bare = await readTraceText(traceCsv(synthesizeRun(design, { seed: 3, layerColumn: false, chipColumn: false })));
    expect(bare.columns).toEqual(['time_s', 'signal']);
    expect(bare.layer).toBeNull();
  });
});
