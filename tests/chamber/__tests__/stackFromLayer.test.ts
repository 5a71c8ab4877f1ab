import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// Reflectance, level cuts, a thin stack below: layer 3 (1.2 QWOT H) is cut on level near its own
// maximum, on layers 1 and 2 (0.3 and 0.4 QWOT). Fitted on the stack below as the pass holds it, a
// 1 % error of layer 2 puts layer 3 4–5 % off (a rate drift at |z| 4–9 takes up the misfit; on the
// simulator's true stack |z| ≤ 2 and layer 3 within 1.3 %), and layer 4 (0.25 QWOT) as much the
// other way. Option stackFromLayer reads the stack below again with each layer's data
// (fit/stackPosterior.ts). Errors against the simulator's truth.
const SCENARIO = scenarios().find((s) => s.name === 'thin level-cut layers (R)')!;
const SEEDS = Array.from({ length: 8 }, (_, i) => 71 + i);

interface LayerErrors {
  d: number[];
  z: number[];
}

async function layerErrors(options: AnalyzeOptions, layer: number): Promise<LayerErrors> {
  const design = parseDesign(SCENARIO.design, 'thin.json');
  const out: LayerErrors = { d: [], z: [] };
  for (const seed of SEEDS) {
    const run = simulateChamberRun(SCENARIO.design, { ...SCENARIO.options, seed });
    const trace = await readTrace(chamberCsvChunks(run), { fileName: `thin seed ${seed}.csv`, layerCount: design.layers.length });
    const result = await analyzeRun(design, trace, { ...options, mode: 'sequential' });
    const truth = run.truth.layers.find((t) => t.layer === layer)!;
    const l = result.layers.find((x) => x.layer === layer)!;
    out.d.push((l.thicknessNm / truth.thicknessNm - 1) * 100);
    out.z.push(Math.abs(l.thicknessNm - truth.thicknessNm) / l.thicknessSigmaNm);
  }
  return out;
}

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length);

describe('sequential: the thin stack below a level cut in reflectance read again with the layer above', () => {
  it(`thin level-cut layers (R), seeds ${SEEDS[0]}–${SEEDS.at(-1)}: layer 3 within 4 % and 3σ with the stack read again, up to 15 % off (RMS over 3 %) on the stack held`, { timeout: 300_000 }, async () => {
    // Each level cut fitted alone (option fitWithNextLayer, on by default, fits it again with the
    // next two layers, which also pins this stack: seeds 71–82 max 14.8 → 3.1 % by itself).
    const read = await layerErrors({ stackFromLayer: true, fitWithNextLayer: false }, 3);
    const held = await layerErrors({ fitWithNextLayer: false }, 3);
    console.log(`layer 3 thickness error, %: stack read again ${read.d.map((v) => v.toFixed(2)).join(' ')}; held ${held.d.map((v) => v.toFixed(2)).join(' ')}`);
    // measured: max 3.43 %, RMS 1.91 %, max 1.1σ; held RMS 6.5 %. (Max 1.51 %, RMS 0.83 % while the
    // chip's offset fit took its thin layers' held indices as exact, fit/fittedOffsets.ts: with them
    // at their σ the offset is not determined, 0 ± 0.31 % of full scale, and this reading of the
    // stack has the offset's direction that much wider.)
    expect(Math.max(...read.d.map(Math.abs))).toBeLessThan(4);
    expect(rms(read.d)).toBeLessThan(2.2);
    expect(Math.max(...read.z)).toBeLessThan(3);
    expect(rms(held.d)).toBeGreaterThan(3);
  });
});
