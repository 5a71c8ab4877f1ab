import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type LayerResult } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun, type ChamberRun } from '..';
import { SILICA, SIO2_FILM, TIO2_FILM } from '../materials';

// The option indexGradient (analysis/fit/indexGradient.ts) on traces of the independent chamber
// simulator, whose option indexWithinLayer grades each layer's index linearly from its start to
// its end. Two half-wave layers (2 QWOT at 600 nm, where the gradient shows at first order) on two
// quarter-waves (which get no trial), in transmittance, with the real chamber's noise (white
// 0.03 % and correlated 0.06 % of full scale). Refit mode, five seeds each.
const tp = { wavelengthNm: 600, mode: 'T' as const, chip: 1, cut: 'turning-point' as const };
const design = {
  format: 'fringelog.design/1' as const, name: 'graded test', referenceWavelengthNm: 600, substrate: SILICA, substrateBackside: true,
  materials: { H: TIO2_FILM, L: SIO2_FILM },
  layers: [{ material: 'H', qwot: 1, monitor: tp }, { material: 'L', qwot: 1, monitor: tp }, { material: 'H', qwot: 2, monitor: tp }, { material: 'L', qwot: 2, monitor: tp }],
};
const NOISE = { whiteNoise: 0.0003, correlatedNoise: { fraction: 0.0006, correlationS: 1 }, rateNmPerS: { H: 0.25, L: 0.5 } };
const SEEDS = [1, 2, 3, 4, 5];

async function analysed(grade: Record<string, number>, seed: number): Promise<{ run: ChamberRun; layers: LayerResult[] }> {
  const run = simulateChamberRun(design, { ...NOISE, seed, indexWithinLayer: grade });
  const parsed = parseDesign(design, 'graded test.json');
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `graded seed ${seed}.csv`, layerCount: parsed.layers.length });
  return { run, layers: (await analyzeRun(parsed, trace, { mode: 'refit', indexGradient: true })).layers };
}

const trueChange = (run: ChamberRun, layer: number) => {
  const t = run.truth.layers.find((l) => l.layer === layer)!;
  return t.indexEnd - t.indexStart;
};

describe('index gradient on the chamber simulator', () => {
  it('a graded film (H +0.02, L −0.01 through each layer): Δn recovered within 3σ where kept, the H half-wave kept in most seeds', { timeout: 300_000 }, async () => {
    let keptH = 0;
    for (const seed of SEEDS) {
      const { run, layers } = await analysed({ H: 0.02, L: -0.01 }, seed);
      // quarter-waves get no trial
      for (const l of layers.filter((x) => x.layer <= 2)) expect(l.indexGradient).toBeUndefined();
      for (const l of layers.filter((x) => x.layer >= 3)) {
        expect(l.indexGradientSigma).toBeGreaterThan(0);
        if (!l.indexGradientKept) continue;
        expect(Math.abs(l.indexGradient! - trueChange(run, l.layer))).toBeLessThan(3 * l.indexGradientSigma!);
        if (l.layer === 3) keptH++;
      }
    }
    expect(keptH).toBeGreaterThanOrEqual(3);
  });

  it('a uniform film: every trial Δn within 3σ of 0 and no gradient kept', { timeout: 300_000 }, async () => {
    for (const seed of SEEDS) {
      const { layers } = await analysed({}, seed);
      for (const l of layers.filter((x) => x.layer >= 3)) {
        expect(l.indexGradientKept).toBe(false);
        expect(Math.abs(l.indexGradient!)).toBeLessThan(3 * l.indexGradientSigma!);
      }
    }
  });
});
