import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalyzeOptions, type LayerResult } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// The last turning-point cut on each chip: nothing after it tells its growth after the cut, so it
// takes the run's shutter time (fit/layerEnds.ts, option shutterTimeGrowth). The simulator's
// shutter here closes at once (its truth: no growth after any cut), and the growth the analysis
// adds is read back from the reported layer as the thickness past its rate law at the logged cut,
// in seconds at its final rate.
const SCENARIO = scenarios().find((s) => s.name === 'correlated noise and spikes, mirror')!;
const SEEDS = [15, 16, 17, 18, 19, 20, 21, 22];

/** Seconds of growth at the final rate that the reported thickness holds past the logged cut. */
function addedGrowthS(l: LayerResult): number {
  const T = l.cutTimeS - l.startTimeS;
  const logged = l.rateNmPerS * T + 0.5 * l.rateDriftNmPerS2 * T * T;
  return (l.thicknessNm - logged) / (l.rateNmPerS + l.rateDriftNmPerS2 * T);
}

async function lastLayerGrowths(options: AnalyzeOptions): Promise<{ growthS: number[]; truthS: number[] }> {
  const design = parseDesign(SCENARIO.design, 'mirror.json');
  const growthS: number[] = [], truthS: number[] = [];
  for (const seed of SEEDS) {
    const run = simulateChamberRun(SCENARIO.design, { ...SCENARIO.options, seed });
    const trace = await readTrace(chamberCsvChunks(run), { fileName: `mirror seed ${seed}.csv`, layerCount: design.layers.length });
    // Option cutPastTurningPoint (on in refit by default) moves the same end to or past the fitted
    // turning point, which this read-back would count as growth: off, the growth alone is read.
    const result = await analyzeRun(design, trace, { cutPastTurningPoint: false, ...options, mode: 'refit' });
    const chips = [...new Set(run.truth.layers.map((t) => t.chip))];
    for (const chip of chips) {
      const truth = run.truth.layers.filter((t) => t.chip === chip).at(-1)!;
      growthS.push(addedGrowthS(result.layers.find((l) => l.layer === truth.layer)!));
      truthS.push(truth.afterCutNm / truth.rateNmPerS);
    }
  }
  return { growthS, truthS };
}

const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;

describe('the growth after a chip\'s last turning-point cut, from the run\'s shutter time', () => {
  it(`refit: about the simulator's 0 s over the chips' last layers (seeds ${SEEDS[0]}–${SEEDS.at(-1)}); bounded at 0 it stands above`, { timeout: 300_000 }, async () => {
    const runMean = await lastLayerGrowths({});
    expect(runMean.growthS).toHaveLength(3 * SEEDS.length);
    expect(Math.max(...runMean.truthS.map(Math.abs))).toBe(0);
    // Measured: the run's mean time over these 8 runs +0.03 s (each run's prediction ±0.17–0.56 s);
    // the same predictions cut to [0, 2 s] (option 'bounded') +0.27 s, about 0.13 % of these layers.
    expect(Math.abs(mean(runMean.growthS))).toBeLessThan(0.12);
    const bounded = await lastLayerGrowths({ shutterTimeGrowth: 'bounded' });
    expect(bounded.growthS.every((g) => g >= -1e-6)).toBe(true);
    expect(mean(bounded.growthS)).toBeGreaterThan(0.18);
  });
});
