import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios, type Mode } from '../scenarios';

// A chip with no dark reading gets its detector offset fitted from its first layers
// (fit/fittedOffsets.ts), a thin one's index held at its material's nominal there. On the
// white-noise BBAR (H 0.01 below its nominal, layer 1 of 0.22 QWOT and layer 2 of 0.41 QWOT held)
// the offset trades against those held indices; the fit's σ left them out, so at low noise it took
// +1.0 ± 0.16 % of full scale where the simulator has none, and every layer erred alike on every
// seed (layer 1 −0.45 %, layer 3 index +0.0064, layer 4 +0.34 %, −0.0042). The held indices' σ
// in the offset's leaves the offset undetermined there, kept at 0. Against the simulator's truth.
const scenario = scenarios().find((s) => s.name === 'white noise, BBAR level cuts')!;

async function analyse(seed: number, mode: Mode) {
  // the scenario's chamber with its white noise 0.1 % of full scale down to 0.001 %
  const run = simulateChamberRun(scenario.design, { ...scenario.options, whiteNoise: 1e-5, seed });
  const design = parseDesign(scenario.design, `${scenario.name}.json`);
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${scenario.name} seed ${seed}.csv`, layerCount: design.layers.length });
  const result = await analyzeRun(design, trace, { mode });
  return run.truth.layers.map((t) => {
    const l = result.layers.find((x) => x.layer === t.layer)!;
    return { thicknessPct: Math.abs(l.thicknessNm / t.thicknessNm - 1) * 100, index: Math.abs(l.index - t.index) };
  });
}

describe('held thin-layer indices in the offset fit (chamber simulator, white noise 0.001 %)', () => {
  // At the scenario's own noise (0.1 %) its layers err by RMS 0.04–0.32 % and index 0.0004–0.0016
  // (seeds 11–26); the errors scale with the noise, so a hundredth of it leaves a few thousandths
  // of a % where the model is exact: 0.05 % and 0.0005 (a tenth of the targets' index) give room.
  it('BBAR cut on level, seeds 11 and 12: every layer within 0.05 % and 0.0005 of the truth', { timeout: 120_000 }, async () => {
    for (const seed of [11, 12]) {
      for (const mode of ['sequential', 'refit'] as const) {
        const layers = await analyse(seed, mode);
        // measured: at most 0.007 % and 0.00004 (before: 0.45 %, 0.0065)
        expect(Math.max(...layers.map((l) => l.thicknessPct))).toBeLessThan(0.05);
        expect(Math.max(...layers.map((l) => l.index))).toBeLessThan(0.0005);
      }
    }
  });
});
