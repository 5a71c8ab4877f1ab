import { describe, expect, it } from 'vitest';
import { layerErrors, type LayerError } from '../harness/accuracyTable';
import { runScenario } from '../harness/runScenario';
import { scenarios } from '../scenarios';

// One quarter-wave MgF2 layer without a layer column, its end placed on the fitted turning point:
// its thickness is the turning point's, λ/(4n) moved by the excess past it, not the rate law's
// extrapolation to a fixed end. Measured over seeds 32–51: the law's σ (1.6–2.3 %) put RMS |z|
// at 0.21; the turning point's (0.37–0.41 %) at 1.10, all within 3σ (fit/turningPointEnd.ts).
const SEEDS = [36, 37, 38, 39, 40, 41, 42, 43, 44, 45, 46, 47];

describe("a single layer placed on its turning point: σ the turning point's", () => {
  it(`the truth within 3σ, and σ not wider than the errors ask (seeds ${SEEDS[0]}–${SEEDS[SEEDS.length - 1]}, refit)`, { timeout: 120_000 }, async () => {
    const scenario = scenarios().find((s) => s.name === 'no layer column, single layer')!;
    const e: LayerError[] = [];
    for (const seed of SEEDS) {
      const { run, results } = await runScenario(scenario, seed, ['refit']);
      e.push(...layerErrors(seed, results.refit, run.truth.layers));
    }
    expect(e).toHaveLength(SEEDS.length);
    const z = e.map((x) => x.zThickness ?? Infinity);
    expect(Math.max(...z)).toBeLessThanOrEqual(3);
    const rms = Math.sqrt(z.reduce((a, v) => a + v * v, 0) / z.length);
    // a σ twice what the errors show would put RMS |z| near 0.5
    expect(rms).toBeGreaterThan(0.6);
  });
});
