import { describe, expect, it, vi } from 'vitest';
import { analyzeRun } from '@/analysis/fit';
import * as choice from '@/analysis/fit/wanderChoice';
import { parseDesign } from '@/analysis/design';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarios } from '../scenarios';

// Every choice analyzeRun makes, seen through the module (the choice itself is unchanged).
const kept: boolean[] = [];
vi.mock('@/analysis/fit/wanderChoice', async (original) => {
  const m = await original<typeof choice>();
  return {
    ...m,
    chooseRateWander: (input: Parameters<typeof m.chooseRateWander>[0]) => {
      const c = m.chooseRateWander(input);
      kept.push(c.wander !== null);
      return c;
    },
  };
});

/** Per seed, the layers that keep the wander, of those tried. */
async function keeps(name: string, rateWander: { fraction: number; correlationS: number } | undefined, seeds: number[], mode: 'sequential' | 'refit' = 'sequential') {
  const scenario = scenarios().find((s) => s.name === name)!;
  const out: { kept: number; tried: number }[] = [];
  for (const seed of seeds) {
    const run = simulateChamberRun(scenario.design, { ...scenario.options, rateWander, seed });
    const design = parseDesign(scenario.design, `${name}.json`);
    const trace = await readTrace(chamberCsvChunks(run), { fileName: `${name} ${seed}.csv`, layerCount: design.layers.length });
    // startTransient off: one pass, so every choice below is the analysis's own
    kept.length = 0;
    await analyzeRun(design, trace, { mode, rateWander: true, startTransient: false });
    out.push({ kept: kept.filter(Boolean).length, tried: kept.length });
  }
  return out;
}

describe('the rate wander is kept where the chamber simulator lets the rate wander, and seldom elsewhere', () => {
  it('correlated noise and spikes, a steady rate: at most 1 layer in 18 keeps it on each seed', { timeout: 300_000 }, async () => {
    // Before the stack below's σ and the growth read from a layer's start entered the choice,
    // 4 layers in 18 kept it on seed 15 (the stack below's errors bending the fringes).
    const r = await keeps('correlated noise and spikes, mirror', undefined, [15, 16, 17]);
    console.log(`steady rate: ${r.map((x) => `${x.kept}/${x.tried}`).join(', ')}`);
    for (const x of r) expect(x.kept).toBeLessThanOrEqual(1);
  });

  it('real chamber without the rate wander, refit (a gain held chip-wide): at most 3 layers in 18 keep it on each seed', { timeout: 300_000 }, async () => {
    // Before the held gain was freed in the choice, 8 and 7 layers in 18 kept it (a misread gain taken for a wander).
    const r = await keeps('real chamber, mirror', undefined, [21, 22], 'refit');
    console.log(`real chamber, steady rate, refit: ${r.map((x) => `${x.kept}/${x.tried}`).join(', ')}`);
    for (const x of r) expect(x.kept).toBeLessThanOrEqual(3);
  });

  it('the same with the rate wandering 1.5 % (15 s): most layers keep it', { timeout: 300_000 }, async () => {
    const r = await keeps('correlated noise and spikes, mirror', { fraction: 0.015, correlationS: 15 }, [15, 16, 17]);
    console.log(`wandering rate: ${r.map((x) => `${x.kept}/${x.tried}`).join(', ')}`);
    const total = r.reduce((s, x) => s + x.kept, 0), tried = r.reduce((s, x) => s + x.tried, 0);
    expect(total).toBeGreaterThanOrEqual(tried / 2);
  });
});
