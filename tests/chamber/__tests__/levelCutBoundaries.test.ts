import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun } from '@/analysis/fit';
import { segmentByDesign } from '@/analysis/fit/designSegments';
import { levelCutEnds } from '@/analysis/fit/levelCutEnds';
import { placeBoundaries } from '@/analysis/fit/placeBoundaries';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// Without a layer column the level cuts' ends and the next layers' starts are placed where the
// readings reach and leave the cut level on the design's curves (fit/levelCutEnds.ts). The film's
// curve there is not the design's (H 0.01 below its nominal, the stack below as cut), and at white
// noise 1e-5 that misfit, not the noise, placed the cuts: up to 0.7 s off (seed 36, layer 2's cut
// at 147.4 s for 148.1 s), layer 1's n·d −1.5 %. Against the simulator's logged times.
const scenario = scenarios().find((s) => s.name === 'no layer column, BBAR level cuts')!;
const noisy = scenarios().find((s) => s.name === 'no layer column, BBAR level cuts, correlated noise')!;

async function traceOf(seed: number, row = scenario, more: Partial<typeof scenario.options> = {}) {
  const run = simulateChamberRun(row.design, { ...row.options, ...more, seed });
  const design = parseDesign(row.design, `${row.name}.json`);
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${row.name} seed ${seed}.csv`, layerCount: design.layers.length });
  return { run, design, trace };
}

/** The segments found without a layer column, their level cuts' ends placed. */
function placed(trace: Awaited<ReturnType<typeof traceOf>>['trace'], design: Awaited<ReturnType<typeof traceOf>>['design']) {
  const by = segmentByDesign(trace, design);
  return levelCutEnds(trace, design, placeBoundaries(trace, design, by.layers, by.windows), by.gain);
}

describe('level-cut boundaries without a layer column (chamber simulator, white noise 0.001 %)', () => {
  // At 0.1 s a sample, the breakpoint search's own step; the growth's slope at the cuts is
  // 1–3e-4 of full scale a second, so 0.25 s is 2.5–7.5σ of a single reading at this noise.
  it('BBAR seeds 33–36: every cut and the start after it within 0.25 s of the logged times', { timeout: 60_000 }, async () => {
    for (const seed of [33, 34, 35, 36]) {
      // the scenario's chamber with its white noise 0.1 % of full scale down to 0.001 %
      const { run, design, trace } = await traceOf(seed, scenario, { whiteNoise: 1e-5 });
      const segments = placed(trace, design);
      for (const truth of run.truth.layers) {
        const seg = segments.find((s) => s.layer === truth.layer)!;
        // measured: at most 0.2 s (before: 0.7 s, seed 36 layer 2; 0.5 s, seed 33 layer 3's start)
        expect(Math.abs(seg.endTimeS - truth.endTimeS)).toBeLessThan(0.25);
        // (the chip's first start has the bare chip before it and is not a level cut's)
        if (truth.layer > 1) expect(Math.abs(seg.startTimeS - truth.startTimeS)).toBeLessThan(0.25);
      }
    }
  });

  it('seed 36, sequential: every layer within 0.5 % of the true optical thickness', { timeout: 60_000 }, async () => {
    const { run, design, trace } = await traceOf(36, scenario, { whiteNoise: 1e-5 });
    const result = await analyzeRun(design, trace, { mode: 'sequential' });
    for (const truth of run.truth.layers) {
      const l = result.layers.find((x) => x.layer === truth.layer)!;
      // measured: at most 0.35 % (layer 2; before: layer 1 −1.50 %, layer 2 −0.78 %)
      expect(Math.abs((l.index * l.thicknessNm) / (truth.index * truth.thicknessNm) - 1) * 100).toBeLessThan(0.5);
    }
  });
});

// The detector of the no-layer-column demo trace (sample-traces/bay2-bb4-run0588-nolayer.truth.json):
// white 0.04 %, AR(1) 0.06 % of full scale with 1 s correlation (about 10 samples), spikes, the
// rate's 1.2 s ramp and 1 % wander: the harness's row 'no layer column, BBAR level cuts,
// correlated noise'. Second differences see a small part of such noise, which made the
// quadratics' χ² gain look large everywhere: the boundaries left the layers (seed 7, layer 2's cut
// 13.5 s early; on the demo trace layer 2 10.2 nm for 38.1 nm).
describe('level-cut boundaries without a layer column (chamber simulator, correlated noise like the demo trace)', () => {
  // With the design's curves alone (bend 0) the worst boundary is 7.7 s off (seed 2, layer 2's cut):
  // the slope at the cuts is 1–3e-4 of full scale a second and the correlated part's σ 6e-4, so a
  // few seconds is the noise's own reach. The bent curves must not add to it: measured at most 7.7 s
  // (before, with the noise from second differences: 11.7 s seed 2, 8.7 s seed 6, 13.5 s seed 7;
  // with the noise from each pause alone and the bent curves in the first round too: 27.9 s, seed
  // 15, layer 2's cut, and layer 3's start 13.6 s early).
  // Seeds 1 and 3: the segmentation matched only the levels at the pauses, and the pause after
  // layer 1, hidden in the noise, lost to a flat stretch 50 s on (layer 2 nearing its turning
  // point, layer 3 starting near the same level): boundaries 83 and 86 s off, sequential layer 2
  // −57.6 % at 15σ. Each candidate layer's shape now counts too (fit/designSegments.ts).
  it('BBAR seeds 1–16: every cut and the start after it within 8 s of the logged times', { timeout: 120_000 }, async () => {
    for (let seed = 1; seed <= 16; seed++) {
      const { run, design, trace } = await traceOf(seed, noisy);
      const segments = placed(trace, design);
      expect(segments.map((p) => p.layer), `seed ${seed}`).toEqual(run.truth.layers.map((t) => t.layer));
      for (const truth of run.truth.layers) {
        const seg = segments.find((s) => s.layer === truth.layer)!;
        expect(Math.abs(seg.endTimeS - truth.endTimeS), `seed ${seed} layer ${truth.layer} end`).toBeLessThan(8);
        if (truth.layer > 1) expect(Math.abs(seg.startTimeS - truth.startTimeS), `seed ${seed} layer ${truth.layer} start`).toBeLessThan(8);
      }
    }
  });

  // A rate that wanders 5 % over 20 s also bends the readings in time: on seed 101 the bent
  // curves took that up and put layer 2's cut 24 s early (refit −21 %), until a bent boundary was
  // held within 2 s of the design curves' placement. Measured now: within 2.7 s, as with no bend.
  it('a rate wandering 5 % over 20 s, seed 101: every cut and the start after it within 8 s', { timeout: 60_000 }, async () => {
    const { run, design, trace } = await traceOf(101, noisy, { rateWander: { fraction: 0.05, correlationS: 20 } });
    const segments = placed(trace, design);
    for (const truth of run.truth.layers) {
      const seg = segments.find((s) => s.layer === truth.layer)!;
      expect(Math.abs(seg.endTimeS - truth.endTimeS), `layer ${truth.layer} end`).toBeLessThan(8);
      if (truth.layer > 1) expect(Math.abs(seg.startTimeS - truth.startTimeS), `layer ${truth.layer} start`).toBeLessThan(8);
    }
  });
});
