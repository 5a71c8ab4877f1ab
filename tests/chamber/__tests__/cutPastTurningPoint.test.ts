import { describe, expect, it } from 'vitest';
import { type AnalyzeOptions } from '@/analysis/fit';
import { runScenario } from '../harness/runScenario';
import { scenarios } from '../scenarios';

// A chip's last turning-point cut: nothing above pins its end, and near a turning point the signal
// is quadratic in the thickness, so the rate law's extrapolated end scatters widely. The controller
// cut only after it saw the turning point, by the simulator's overshoot (0.4 ± 0.3 % of the layer,
// one-sided) past it: option cutPastTurningPoint takes the fit's thickness at the last logged
// sample under the prior "at or past the fitted turning point, by at most
// turningPointOvershootPct" (fit/cutPastTurningPoint.ts). Errors against the simulator's truth.
const SCENARIO = scenarios().find((s) => s.name === 'correlated noise and rate wander, mirror')!;
const SEEDS = [15, 16, 17, 18, 19, 20, 21, 22];

/** Thickness errors, %, of each chip's last layer over the seeds (refit), with their z. */
async function lastLayerErrors(options: AnalyzeOptions): Promise<{ errors: number[]; z: number[] }> {
  const errors: number[] = [], z: number[] = [];
  for (const seed of SEEDS) {
    const { run, results } = await runScenario(SCENARIO, seed, ['refit'], options);
    const result = results.refit!;
    for (const chip of new Set(run.truth.layers.map((t) => t.chip))) {
      const truth = run.truth.layers.filter((t) => t.chip === chip).at(-1)!;
      const l = result.layers.find((x) => x.layer === truth.layer)!;
      errors.push((l.thicknessNm / truth.thicknessNm - 1) * 100);
      z.push(Math.abs(l.thicknessNm - truth.thicknessNm) / l.thicknessSigmaNm);
    }
  }
  return { errors, z };
}

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length);

describe('a chip\'s last turning-point cut at or past its fitted turning point', () => {
  it(`refit, rate-wander mirror, seeds ${SEEDS[0]}–${SEEDS.at(-1)}: the chips' last layers' RMS error falls; all within 3σ`, { timeout: 300_000 }, async () => {
    // Measured: RMS 0.368 % with the option, 0.516 % without, 24 layers (0.495 % and 0.637 % before the
    // index pooling read the detector offset's share as common to the layers, fit/commonShiftTrend.ts).
    // Since a cut is held only where its reading's σ is within the overshoot allowed (overshootSeen:
    // a wide σ let the prior pull a late hand cut into it), the layers of σ over 1 % keep their own
    // reading: RMS 0.460 % with the option.
    const held = await lastLayerErrors({ cutPastTurningPoint: true });
    expect(held.errors).toHaveLength(3 * SEEDS.length);
    expect(Math.max(...held.z)).toBeLessThan(3);
    const free = await lastLayerErrors({ cutPastTurningPoint: false });
    expect(rms(free.errors)).toBeGreaterThan(0.47);
    expect(rms(held.errors)).toBeLessThan(rms(free.errors) - 0.03);
  });
});
