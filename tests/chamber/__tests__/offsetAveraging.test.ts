import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios, type Mode } from '../scenarios';

// A chip with no dark reading gets its detector offset fitted from its first layers
// (fit/fittedOffsets.ts). Option offsetAveraging (on by default) averages that fit with the offset
// assumed (zero), each by the evidence for it, and carries both into σ (fit/offsetAveraging.ts);
// the threshold it replaces took a fit only beyond 3σ. The simulator's truth (its stray light and
// every layer's index and thickness) is what the results are taken against.
const byName = (name: string) => scenarios().find((s) => s.name === name)!;

async function analyse(name: string, seed: number, mode: Mode, options: AnalyzeOptions = {}) {
  const scenario = byName(name);
  const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
  const design = parseDesign(scenario.design, `${name}.json`);
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `${name} seed ${seed}.csv`, layerCount: design.layers.length });
  const result = await analyzeRun(design, trace, { ...options, mode });
  const layers = run.truth.layers.map((t) => {
    const l = result.layers.find((x) => x.layer === t.layer)!;
    return {
      thicknessPct: Math.abs(l.thicknessNm / t.thicknessNm - 1) * 100, index: Math.abs(l.index - t.index),
      zThickness: Math.abs(l.thicknessNm - t.thicknessNm) / l.thicknessSigmaNm, zIndex: Math.abs(l.index - t.index) / l.indexSigma,
    };
  });
  return { run, result, layers };
}

describe('option offsetAveraging (chamber simulator)', () => {
  // Seeds 59 and 60: both chips' fits pool to 0.46–0.47 % of full scale for a true 0.5 %, 2.9σ from
  // zero once the rate model's systematic 0.15 % is in σ; the threshold kept 0 and gave (sequential/
  // refit) 1.66/1.44 % and index 0.029/0.027, 9/7 of 12 layers with a figure beyond 3σ.
  it('T monitoring with stray light, seeds 59 and 60: the offset within 3σ of the stray light, every layer within 0.7 % and 0.006 of the truth and within 3σ', { timeout: 180_000 }, async () => {
    for (const seed of [59, 60]) {
      for (const mode of ['sequential', 'refit'] as const) {
        const { run, result, layers } = await analyse('T monitoring with stray light', seed, mode);
        result.chips.forEach((c, i) => expect(Math.abs(c.offset - run.truth.chips[i].offset)).toBeLessThan(3 * c.offsetSigma));
        // measured: sequential 0.52 %, 0.0046; refit 0.34 %, 0.0011; none beyond 3σ
        expect(Math.max(...layers.map((l) => l.thicknessPct))).toBeLessThan(0.7);
        expect(Math.max(...layers.map((l) => l.index))).toBeLessThan(0.006);
        expect(Math.max(...layers.map((l) => Math.max(l.zThickness, l.zIndex)))).toBeLessThan(3);
      }
    }
  });

  // Seed 21 of the rate-wander mirror has no stray light, but its wandering rate fits 0.79 % of full
  // scale at 3.2σ: taken whole by the threshold, its sequential indices erred by up to 14.9σ (13 of
  // 54 figures beyond 3σ). Averaged, the offset is nearly the same (0.78 %), but its σ is in the layers'.
  it('rate-wander mirror without stray light, seed 21, sequential: a spurious offset\'s error within the layers\' σ', { timeout: 120_000 }, async () => {
    const { layers } = await analyse('correlated noise and rate wander, mirror', 21, 'sequential');
    // measured: index at most 3.4σ, thickness 2.3σ
    expect(Math.max(...layers.map((l) => l.zIndex))).toBeLessThan(4);
    expect(Math.max(...layers.map((l) => l.zThickness))).toBeLessThan(3);
  });
});
