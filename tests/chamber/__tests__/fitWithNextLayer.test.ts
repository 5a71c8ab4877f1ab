import { describe, expect, it } from 'vitest';
import { type AnalyzeOptions } from '@/analysis/fit';
import { layerErrors, summarize, type Summary } from '../harness/accuracyTable';
import { runScenario } from '../harness/runScenario';
import { scenarios, WHITE_TARGETS } from '../scenarios';

// A four-layer AR cut on level, layer by layer. A level cut's own samples leave its index and
// thickness on one curve (its end level gives the stack's transmittance, not the admittance the
// next layer grows on): the thin layer 2 (0.41 QWOT) came out up to 1.5 % off in n·d, and layer 4
// (1.03 QWOT, cut just past its turning point) stood on that error, 0.75 % off; layer 1
// (0.22 QWOT) was held at the nominal index with the film 0.01 below it. Option fitWithNextLayer
// (on by default) fits each level cut again with the next two layers (fit/fitWithNextLayer.ts).
// Errors against the simulator's truth, the white-noise targets of the accuracy harness
// (scenarios.ts WHITE_TARGETS).
const SCENARIO = scenarios().find((s) => s.name === 'white noise, BBAR level cuts')!;
const SEEDS = [11, 12, 13, 14, 15, 16, 17, 18];
// The same AR with every chamber effect: the rate starts up over 1.5 s as the shutter opens and
// the lamp drifts −1 %/h, which a window read as the stack below; now a window that shows the
// start-up reads it on a start delay's clock, with the lamp's drift under its prior.
const CHAMBER = scenarios().find((s) => s.name === 'real chamber, BBAR')!;
const CHAMBER_SEEDS = [21, 22, 23, 24];

async function sequential(options: AnalyzeOptions, scenario = SCENARIO, seeds = SEEDS): Promise<Summary> {
  const errors = [];
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, ['sequential'], options);
    errors.push(...layerErrors(seed, results.sequential, run.truth.layers));
  }
  return summarize(errors);
}

describe('sequential: each level cut fitted again with the layers that grow on it', () => {
  it(`white-noise BBAR, seeds ${SEEDS[0]}–${SEEDS.at(-1)}: within the white-noise targets with the option, not without`, { timeout: 300_000 }, async () => {
    // Measured: thickness max 0.240 %, cut 0.326 % QWOT, thin n·d 0.821 %, all within 3σ with the
    // option; 0.749 %, 0.782 % QWOT, 1.791 % without (layer 1 held at the nominal index).
    const next = await sequential({ fitWithNextLayer: true });
    expect(next.missing).toBe(0);
    expect(next.maxThicknessPct).toBeLessThan(WHITE_TARGETS.thicknessPct);
    expect(next.maxCutQwotPct).toBeLessThan(WHITE_TARGETS.cutQwotPct);
    expect(next.maxThinOpticalPct).toBeLessThan(WHITE_TARGETS.thinOpticalPct);
    // the index at the target's edge in either mode over these seeds (0.0031 with, 0.0033 without;
    // refit 0.0029 over seeds 11–26): layers 3 and 4's own readings, which the window moves little
    expect(next.maxIndex).toBeLessThan(0.0035);
    expect(next.coverage).toEqual({ thickness: 1, index: 1, cut: 1 });
    const own = await sequential({ fitWithNextLayer: false });
    expect(own.maxThicknessPct).toBeGreaterThan(0.5);
    expect(own.maxThinOpticalPct).toBeGreaterThan(1.2);
  });

  it(`real-chamber BBAR, seeds ${CHAMBER_SEEDS[0]}–${CHAMBER_SEEDS.at(-1)}: where the next layers show the rate's start-up, read on its clock: the layers of ≥ 0.5 QWOT closer than each level cut alone`, { timeout: 300_000 }, async () => {
    // Measured, seeds 21–24: max 0.32 % (RMS 0.22 %) against 1.48 % (0.93 %) with each level cut
    // alone; seeds 21–36: 2.08 % (0.73 %) against 2.48 % (1.07 %); coverage 100 % both. Not the thin
    // layers' n·d: 2.39 % against 1.48 % on these seeds (4.65 against 4.37 % on seeds 21–36), layer 2
    // (0.41 QWOT) reading +2.3 % on average, the start of its own window on real time. Before, the
    // windows of a chip that showed the start-up were put back as the pass left them: the same as
    // each level cut alone here, 2.05 % with them kept on real time.
    const next = await sequential({ fitWithNextLayer: true }, CHAMBER, CHAMBER_SEEDS);
    const own = await sequential({ fitWithNextLayer: false }, CHAMBER, CHAMBER_SEEDS);
    expect(next.missing).toBe(0);
    expect(next.maxThicknessPct).toBeLessThan(0.8);
    expect(own.maxThicknessPct).toBeGreaterThan(1.2);
    expect(next.rmsThicknessPct).toBeLessThan(0.6 * own.rmsThicknessPct);
    expect(next.coverage).toEqual({ thickness: 1, index: 1, cut: 1 });
  });
});

// Thin level cuts in reflectance: the chip's first layer (0.3 QWOT H) is held at its material's
// index from the run's other H layers (3 and 5, level cuts on a thin stack). Held before the
// windows, that index came from the pass's readings of those layers, up to 0.025 off; held again
// once the windows are done, with its own window fitted again (fitHeldAgain), from theirs.
// Measured, seeds 71–86 (with each window's own gains): layer 1 n·d RMS 0.93 → 0.41 %, max −2.93 →
// −0.78 % (seed 75); its index max 0.025 → 0.011; the other layers as before but layer 4 (0.25 QWOT
// L, held too) n·d max 2.76 → 2.67 %; with one gain per window in R (below) layer 1 n·d RMS 1.05 →
// 0.30 %, max −3.21 → −0.67 %. Errors against the simulator's truth.
const THIN_R = scenarios().find((s) => s.name === 'thin level-cut layers (R)')!;

describe('sequential: a held thin level cut held again from the layers as the windows left them', () => {
  it('thin level cuts in R, seed 75: the chip\'s first layer within the thin layers\' n·d target and its index within 0.012', { timeout: 300_000 }, async () => {
    const { run, results } = await runScenario(THIN_R, 75, ['sequential'], {});
    const first = layerErrors(75, results.sequential, run.truth.layers).find((e) => e.layer === 1)!;
    console.log(`seed 75 layer 1: n·d ${first.opticalPct!.toFixed(2)} %, index ${first.index!.toFixed(4)}`);
    expect(Math.abs(first.opticalPct!)).toBeLessThan(THIN_R.targets.thinOpticalPct);
    expect(Math.abs(first.index!)).toBeLessThan(0.012);
  });
});

// In reflectance a level cut's end level is a small reflectance times the gain: each window
// layer's own gain (free within the pass's 0.5 % prior) traded against the thin stack below, and
// the 1.2-QWOT layer 3 on the 0.4-QWOT layer 2 read 1.5 % RMS off (refit, one gain for the chip,
// 0.67 %). The window's layers now share one gain (fitWithNextLayer.ts sharesGain).
// Measured, seeds 71–78: layer 3 RMS 1.52 → 0.80 %, cut error max 2.71 → 1.63 % QWOT.
describe('sequential, reflectance: one gain for a window\'s layers', () => {
  it('thin level cuts in R, seeds 71–78: layer 3 (1.2 QWOT) within 1 % RMS and every cut within 2 % QWOT', { timeout: 300_000 }, async () => {
    const errors = [];
    for (const seed of [71, 72, 73, 74, 75, 76, 77, 78]) {
      const { run, results } = await runScenario(THIN_R, seed, ['sequential'], {});
      errors.push(...layerErrors(seed, results.sequential, run.truth.layers));
    }
    const third = errors.filter((e) => e.layer === 3).map((e) => e.thicknessPct!);
    const rms = Math.sqrt(third.reduce((a, v) => a + v * v, 0) / third.length);
    const cut = Math.max(...errors.map((e) => Math.abs(e.cutQwotPct!)));
    console.log(`layer 3 RMS ${rms.toFixed(2)} %, cut max ${cut.toFixed(2)} % QWOT`);
    expect(rms).toBeLessThan(1);
    expect(cut).toBeLessThan(2);
  });
});
