import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// The note that the held lamp drift's assumed stability makes up most of some layers' σ
// (analysis/fit/lampDriftNote.ts), on the chamber simulator's white-noise BBAR: a steady lamp,
// four level cuts on one chip, no reference column, whose last layer's index reads the drift most
// (0.1 %/h still makes up 61–77 % of its σ²). What the note says must hold: with a
// steadier lamp assumed, the named layers' σ shrink.
const scenario = scenarios().find((s) => s.name === 'white noise, BBAR level cuts')!;

async function analyse(mode: 'sequential' | 'refit', options: AnalyzeOptions) {
  const run = simulateChamberRun(scenario.design, { ...scenario.options, seed: scenario.seeds[0] });
  const design = parseDesign(scenario.design, 'bbar.json');
  const trace = await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
  return analyzeRun(design, trace, { mode, ...options });
}

const noteOf = (warnings: readonly string[]) => warnings.find((w) => w.startsWith('lamp drift assumed:')) ?? null;

describe('the note on a held lamp drift\'s share of σ', () => {
  for (const mode of ['sequential', 'refit'] as const) {
    it(`${mode}: names the layers whose σ the assumed 1 %/h makes up, which a steadier lamp then narrows`, { timeout: 120_000 }, async () => {
      const loose = await analyse(mode, {});
      const note = noteOf(loose.warnings);
      expect(note).not.toBeNull();
      const named = [...note!.matchAll(/layer (\d+) \(/g)].map((m) => Number(m[1]));
      expect(named).toContain(4);
      const steady = await analyse(mode, { lampStabilityPerHour: 0.0003 });
      expect(noteOf(steady.warnings)).toBeNull();
      for (const n of named) {
        const a = loose.layers[n - 1], b = steady.layers[n - 1];
        // more than half of σ² was the drift's: σ at least √2 times wider with it
        const wider = Math.max(a.thicknessSigmaNm / b.thicknessSigmaNm, a.indexHeld ? 0 : a.indexSigma / b.indexSigma);
        expect(wider).toBeGreaterThan(Math.SQRT2 * 0.95);
      }
      // with no drift assumed at all there is none to name
      expect(noteOf((await analyse(mode, { lampStabilityPerHour: 0 })).warnings)).toBeNull();
    });
  }
});
