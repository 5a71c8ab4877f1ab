import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, DEFAULT_LAMP_STABILITY_PER_HOUR, type AnalysisResult } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun, type ChamberRun } from '..';
import { layerErrors, summarize } from '../harness/accuracyTable';
import { bbarDesign, REAL_CHAMBER } from '../scenarios';

// The lamp drifting within one chip, fitted under its Gaussian prior (AnalyzeOptions.lampStabilityPerHour),
// on the simulator's real-chamber BBAR (four layers on one chip, level cuts, ~13 min). The rate's
// ramp as the shutter opens is switched off: the model has no ramp, and its misfit reads as a drift
// of its own (see the option's doc comment). The truth is the simulator's lampDriftPerHour.
const RAMP_OFF = { ...REAL_CHAMBER, rateNmPerS: { H: 0.25, L: 0.5 }, rampS: 0 };

async function analyse(lampDriftPerHour: number, seed: number, lampStabilityPerHour: number): Promise<{ run: ChamberRun; result: AnalysisResult }> {
  const run = simulateChamberRun(bbarDesign(), { ...RAMP_OFF, lampDriftPerHour, seed });
  const design = parseDesign(bbarDesign(), 'bbar.json');
  const trace = await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
  return { run, result: await analyzeRun(design, trace, { mode: 'refit', lampStabilityPerHour }) };
}

describe('the lamp drift within a chip (refit, Gaussian prior)', () => {
  it('recovers a drift of −1 %/h within 2σ, and the index error and the 3σ coverage improve', { timeout: 300_000 }, async () => {
    const on = [], off = [];
    for (const seed of [21, 22]) {
      const a = await analyse(-0.01, seed, DEFAULT_LAMP_STABILITY_PER_HOUR);
      const chip = a.result.chips[0];
      expect(chip.gainDriftPerHour).toBeDefined();
      expect(Math.abs(chip.gainDriftPerHour! - -0.01)).toBeLessThan(2 * chip.gainDriftSigmaPerHour!);
      // The data tell it: the posterior is narrower than the prior.
      expect(chip.gainDriftSigmaPerHour!).toBeLessThan(0.5 * DEFAULT_LAMP_STABILITY_PER_HOUR);
      on.push(...layerErrors(seed, a.result, a.run.truth.layers));
      const b = await analyse(-0.01, seed, 0);
      off.push(...layerErrors(seed, b.result, b.run.truth.layers));
    }
    const sOn = summarize(on), sOff = summarize(off);
    // Measured: index 0.032 → 0.009, coverage (d, n, cut) 63/50/75 → 100/100/100 %.
    expect(sOn.maxIndex).toBeLessThan(0.5 * sOff.maxIndex);
    expect(sOn.coverage.index!).toBeGreaterThan(sOff.coverage.index!);
    expect(sOn.coverage.thickness!).toBeGreaterThanOrEqual(sOff.coverage.thickness!);
  });

  it('finds no drift where the lamp holds, and the layers do not get worse beyond the noise', { timeout: 300_000 }, async () => {
    const on = [], off = [];
    for (const seed of [21, 22]) {
      const a = await analyse(0, seed, DEFAULT_LAMP_STABILITY_PER_HOUR);
      const chip = a.result.chips[0];
      expect(Math.abs(chip.gainDriftPerHour!)).toBeLessThan(2 * chip.gainDriftSigmaPerHour!);
      on.push(...layerErrors(seed, a.result, a.run.truth.layers));
      const b = await analyse(0, seed, 0);
      off.push(...layerErrors(seed, b.result, b.run.truth.layers));
    }
    const sOn = summarize(on), sOff = summarize(off);
    console.log(`no lamp drift: max|d| ${sOff.maxThicknessPct.toFixed(3)} → ${sOn.maxThicknessPct.toFixed(3)} %, max|n| ${sOff.maxIndex.toFixed(4)} → ${sOn.maxIndex.toFixed(4)}`);
    // Beyond the noise: the largest error may grow by under 0.3 % in thickness and 0.003 in index
    // (measured: 0.59 → 0.70 %, 0.0041 → 0.0055; a freed γ costs some precision).
    expect(sOn.maxThicknessPct).toBeLessThan(sOff.maxThicknessPct + 0.3);
    expect(sOn.maxIndex).toBeLessThan(sOff.maxIndex + 0.003);
    expect(sOn.coverage.thickness!).toBeGreaterThanOrEqual(sOff.coverage.thickness!);
  });
});
