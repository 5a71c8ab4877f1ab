import { describe, expect, it } from 'vitest';
import { analyzeRun } from '@/analysis/fit';
import { parseDesign } from '@/analysis/design';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { layerErrors, type LayerError } from '../harness/accuracyTable';
import { scenarios, type Scenario } from '../scenarios';

// After a level cut the growth is read from the settled idle level against the layer's last
// readings (fit/layerEnd.ts levelEvidence). Both are means of a few seconds of readings, about
// as long as the simulator's correlated noise (0.06 % of full scale, 1 s) takes to decorrelate,
// so their own scatter and lag-1 correlation told σ a few times too small; the run's white +
// AR(1) noise model (fit/idleNoiseModel.ts) now floors both. The simulator's shutters close at
// once, so every growth read there is error. Measured (refit): 'R monitoring with an offset'
// seeds 64 and 65, layer 4's growth read 0.15–0.6 nm, layer 5 (H, started on layer 4's
// slope) index +0.0060 ± 0.0017 and +0.0120 ± 0.0033 (3.5σ, 3.6σ), now +0.0037 ± 0.0018 and
// +0.0024 ± 0.0017; 'thin level-cut layers (R)' seed 77, layer 2 thickness +2.39 % at 5.3σ,
// now every layer within 0.4 %.
async function refitErrors(scenario: Scenario, seed: number): Promise<LayerError[]> {
  const design = parseDesign(scenario.design, `${scenario.name}.json`);
  const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${scenario.name} ${seed}.csv`, layerCount: design.layers.length });
  return layerErrors(seed, await analyzeRun(design, trace, { mode: 'refit' }), run.truth.layers);
}

const byName = (name: string) => scenarios().find((s) => s.name === name)!;

describe('the growth after a level cut under correlated noise', () => {
  it('R with an offset, refit, seeds 64–65: the index of the layer on the level cut within 0.005 and every index within 3σ', { timeout: 300_000 }, async () => {
    for (const seed of [64, 65]) {
      const e = await refitErrors(byName('R monitoring with an offset'), seed);
      const above = e.find((x) => x.layer === 5)!;
      console.log(`seed ${seed}: layer 5 index error ${above.index!.toFixed(4)} (${above.zIndex!.toFixed(1)}σ)`);
      expect(Math.abs(above.index!)).toBeLessThan(0.005);
      for (const x of e) if (x.zIndex !== null) expect(x.zIndex).toBeLessThanOrEqual(3);
    }
  });

  it('thin level-cut layers in R, refit, seed 77: every thickness within 1 % and within 3σ', { timeout: 300_000 }, async () => {
    const e = await refitErrors(byName('thin level-cut layers (R)'), 77);
    console.log(`thickness errors ${e.map((x) => `${x.thicknessPct!.toFixed(2)} % (${x.zThickness!.toFixed(1)}σ)`).join(', ')}`);
    for (const x of e) {
      expect(Math.abs(x.thicknessPct!)).toBeLessThan(1);
      expect(x.zThickness!).toBeLessThanOrEqual(3);
    }
  });
});
