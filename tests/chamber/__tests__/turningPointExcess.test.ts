import { describe, expect, it } from 'vitest';
import { layerErrors, type LayerError } from '../harness/accuracyTable';
import { runScenario } from '../harness/runScenario';
import { scenarios } from '../scenarios';

// Without a layer column a turning-point cut ends on the fitted layer's turning point; the
// simulator's controller cuts 0.4 ± 0.3 % of the layer past it (never before), which the trace
// shows only to second order. σ carries the excess the data leave open, and the excess of the
// layer below, which moved the layer's own turning point (fit/turningPointExcess.ts).
const SEEDS = [37, 38, 39];

async function errors(mode: 'sequential' | 'refit'): Promise<LayerError[]> {
  const scenario = scenarios().find((s) => s.name === 'no layer column')!;
  const out: LayerError[] = [];
  for (const seed of SEEDS) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    out.push(...layerErrors(seed, results[mode], run.truth.layers));
  }
  return out;
}

const within = (z: (number | null)[], k: number) => z.filter((v) => v !== null && v <= k).length / z.length;
const rms = (z: (number | null)[]) => Math.sqrt(z.reduce<number>((a, v) => a + (v ?? 0) ** 2, 0) / z.length);

describe('turning-point cuts placed without a layer column: the excess past the turning point in σ', () => {
  for (const mode of ['sequential', 'refit'] as const) {
    it(`${mode}: the truth within 3σ for ≥ 95 % of 27 layers (seeds ${SEEDS.join(', ')}), σ not wider than the errors ask`, { timeout: 300_000 }, async () => {
      const e = await errors(mode);
      expect(e).toHaveLength(27);
      const zCut = e.map((x) => x.zCut), zD = e.map((x) => x.zThickness);
      // Measured: before, the cut within 3σ for 93 % (sequential) and 74 % (refit), |z| up to 5.5
      // and 10.4, RMS 1.7 and 3.3; after, 100 % in both, |z| at most 2.0, RMS 0.61–0.69.
      expect(within(zCut, 3)).toBeGreaterThanOrEqual(0.95);
      expect(within(zD, 3)).toBeGreaterThanOrEqual(0.95);
      // σ honest, not merely wide: a σ twice what the errors show would put RMS |z| near 0.35.
      expect(rms(zCut)).toBeGreaterThan(0.45);
      expect(rms(zD)).toBeGreaterThan(0.45);
    });
  }
});
