import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { segmentByDesign } from '@/analysis/fit/designSegments';
import { placeBoundaries } from '@/analysis/fit/placeBoundaries';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// Without a layer or chip column, a layer's slow stretch next to a chip change broke the pause's
// flat into fragments that step by more than the level tolerance, and the search for the boundary
// stopped at the first of them: on the accuracy harness's 12-layer run, seed 104's chip-1 top
// layer (a rate wandering low near its turning point) ended 48 s early, seed 108's chip-2 first
// layer (the stationary start of a quarter-wave on the bare chip) started 39 s late; 6 of seeds
// 101–140 had such a boundary 34–49 s off (seed 104's layer 6 then read 26.7 % thin).
const scenario = scenarios().find((s) => s.name === 'no layer or chip column, 12 layers on 2 chips')!;

describe('layer boundaries placed without a layer column next to a chip change', () => {
  for (const seed of [104, 108]) {
    it(`seed ${seed}: every layer's placed start and end within 6 s of the logged ones`, { timeout: 60_000 }, async () => {
      const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
      const design = parseDesign(scenario.design, 'chip change.json');
      const trace = await readTrace(chamberCsvChunks(run), { fileName: `chip change seed ${seed}.csv`, layerCount: design.layers.length });
      const segments = segmentByDesign(trace, design);
      const placed = placeBoundaries(trace, design, segments.layers, segments.windows);
      expect(placed.map((p) => p.layer)).toEqual(run.truth.layers.map((t) => t.layer));
      // A turning-point cut's placed end lies before the logged cut by the overshoot (up to about
      // 1 % of the layer, 3–4 s here) and the noise at the turning point; measured after the
      // change: within 5.4 s over seeds 35, 36 and 101–140.
      placed.forEach((p, i) => {
        const truth = run.truth.layers[i];
        expect(Math.abs(p.startTimeS - truth.startTimeS), `layer ${p.layer} start`).toBeLessThan(6);
        expect(Math.abs(p.endTimeS - truth.endTimeS), `layer ${p.layer} end`).toBeLessThan(6);
      });
    });
  }
});
