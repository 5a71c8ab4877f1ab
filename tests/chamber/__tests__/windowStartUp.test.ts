import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun, type ChamberOptions } from '..';
import { bbarDesign } from '../scenarios';

// Sequential mode fits each level cut again with the next two layers on its chip (option
// fitWithNextLayer, analysis/fit/fitWithNextLayer.ts). The upper layers' starts carry the rate's
// start-up as the shutter opens, which those windows took into the layers below; a chip whose
// windows showed it was put back as the pass left it, and the pass holds a thin first layer at its
// material's nominal index. Where the run's index is off the nominal, that chip's layers stayed
// off with it and the thick layer above misfit. Now such a window reads the start-up on a start
// delay's clock, with the lamp's drift under its prior (a drift held at 0 reads as a start-up).
//
// The run: the chamber simulator (tests/chamber, no optics code shared with analysis/) on the
// four-layer AR cut on level, with what the demo's run B2-0587 carries (sample-traces/generate.ts)
// and the two effects it holds back on: Ta₂O₅ 0.015 below its nominal index and graded by 0.004
// across the layer, the rate ramping up over 1.2 s as the shutter opens, the lamp drifting
// −0.5 %/h, correlated noise 0.06 % (1 s) and white 0.04 %, spikes, rate wander and scatter, the
// shutter closing over 0.1–0.4 s, level cuts 0.1–0.25 s late, 10 s of dark samples.
const DEMO_LIKE: ChamberOptions = {
  whiteNoise: 0.0004, correlatedNoise: { fraction: 0.0006, correlationS: 1 }, spikes: { perMinute: 0.2, amplitude: [0.002, 0.008], maxSamples: 2 },
  jitterFraction: 0.15, rampS: 1.2, rateWander: { fraction: 0.01, correlationS: 20 }, rateScatter: 0.02, shutterCloseS: [0.1, 0.4],
  turningPointOvershoot: { meanPct: 0.3, sigmaPct: 0.2 }, levelLatencyS: [0.1, 0.25], indexScatter: 0.001, lampDriftPerHour: -0.005,
  gain: 1.94, darkOffset: 0.004, darkS: 10, indexWithinLayer: { H: 0.004 }, rateNmPerS: { H: 0.25, L: 0.6 }, indexOffset: { H: -0.015 },
};

async function sequentialRun(seed: number) {
  const design = parseDesign(bbarDesign(), 'bbar4.json');
  const run = simulateChamberRun(bbarDesign(), { ...DEMO_LIKE, seed });
  const trace = await readTrace(chamberCsvChunks(run), { fileName: `bbar4 seed ${seed}.csv`, layerCount: design.layers.length });
  const result = await analyzeRun(design, trace, { mode: 'sequential' });
  return run.truth.layers.map((t) => {
    const l = result.layers.find((x) => x.layer === t.layer)!;
    return { layer: t.layer, errPct: (l.thicknessNm / t.thicknessNm - 1) * 100, z: Math.abs(l.thicknessNm - t.thicknessNm) / l.thicknessSigmaNm, warnings: l.warnings };
  });
}

describe('sequential: a window whose upper layers show the rate\'s start-up, read on its clock', () => {
  it('the demo-like AR with its lamp drift and ramp on, seeds 587–592: no residual warning, the thin layers near their truth', { timeout: 300_000 }, async () => {
    // Measured, seeds 587–602: layers 1–4 RMS 2.90/3.22/0.83/1.09 % → 1.09/1.68/0.46/1.00 %, max
    // 3.77/8.03/1.28/2.28 → 1.67/3.81/0.77/2.17 %; layer 3 "residuals 1.9–2.6× the noise" on 3 runs → 0;
    // every layer within 3σ either way. Seed 587 (the demo's): layer 1 −3.34 → −1.07 %, layer 2 −6.36 →
    // +1.86 %, layer 3 warned "residuals 2.6×", now nothing.
    const rows: Awaited<ReturnType<typeof sequentialRun>> = [];
    for (let seed = 587; seed <= 592; seed++) rows.push(...(await sequentialRun(seed)));
    expect(rows.filter((r) => r.warnings.some((w) => w.startsWith('residuals')))).toEqual([]);
    const rms = (layer: number) => Math.sqrt(rows.filter((r) => r.layer === layer).reduce((a, r) => a + r.errPct ** 2, 0) / 6);
    // before: 2.75 % and 3.78 % on these seeds
    expect(rms(1)).toBeLessThan(1.5);
    expect(rms(2)).toBeLessThan(2.5);
    expect(Math.max(...rows.map((r) => r.z))).toBeLessThan(3);
  });
});
