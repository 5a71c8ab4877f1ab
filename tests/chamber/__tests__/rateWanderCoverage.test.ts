import { describe, expect, it } from 'vitest';
import { analyzeRun } from '@/analysis/fit';
import { parseDesign } from '@/analysis/design';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

/** |error|/σ of thickness and cut error of every layer, option rateWander in refit, against the simulator's truth. */
async function zScores(name: string, seeds: number[]) {
  const scenario = scenarios().find((s) => s.name === name)!;
  const z: { thickness: number; cut: number }[] = [];
  for (const seed of seeds) {
    const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
    const design = parseDesign(scenario.design, `${name}.json`);
    const trace = await readTrace(chamberCsvChunks(run), { fileName: `${name} ${seed}.csv`, layerCount: design.layers.length });
    const result = await analyzeRun(design, trace, { mode: 'refit', rateWander: true });
    for (const t of run.truth.layers) {
      const l = result.layers.find((x) => x.layer === t.layer)!;
      z.push({
        thickness: Math.abs(l.thicknessNm - t.thicknessNm) / l.thicknessSigmaNm,
        cut: Math.abs(l.cutErrorQwotPct - t.cutErrorQwotPct) / l.cutErrorSigmaQwotPct,
      });
    }
  }
  return z;
}

const within3 = (v: number[]) => v.filter((x) => x <= 3).length / v.length;

// Issue 7's target for σ: the truth within the reported 3σ for ≥ 95 % of layers. Seeds past the
// accuracy harness's own. Before a layer whose own choice kept no wander took its material's
// shared one (fit/pooledWander.ts) in the final joint fit, the real-chamber mirror's seeds 21–40
// gave 96.1 % with RMS z 1.41 (then 98.3 %, 1.18). Over 20 seeds, not 4: with the start-delay
// profiles on the layers below refitted at each δ (fit/startDelayChain.ts) seeds 27–30 alone gave
// 94.4 % (68 of 72), seeds 21–40 97.8 % (98.3 % before it); the rate-wander mirror 98.9 %.
describe('option rateWander, refit: the truth within 3σ on the chamber simulator', () => {
  for (const name of ['correlated noise and rate wander, mirror', 'real chamber, mirror']) {
    it(`${name}, seeds 21–40: thickness and cut error within 3σ for ≥ 95 % of layers`, { timeout: 300_000 }, async () => {
      const z = await zScores(name, Array.from({ length: 20 }, (_, i) => 21 + i));
      const d = within3(z.map((x) => x.thickness)), cut = within3(z.map((x) => x.cut));
      console.log(`${name}: 3σ coverage d ${(d * 100).toFixed(1)} %, cut ${(cut * 100).toFixed(1)} % of ${z.length} layers`);
      expect(d).toBeGreaterThanOrEqual(0.95);
      expect(cut).toBeGreaterThanOrEqual(0.95);
    });
  }
});
