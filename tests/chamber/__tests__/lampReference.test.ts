import { describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type AnalysisResult, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsv, chamberCsvChunks, simulateChamberRun, type ChamberOptions, type ChamberRun } from '..';
import { layerErrors, misses, summarize } from '../harness/accuracyTable';
import { bbarDesign, CHAMBER_TARGETS, LAMP_REFERENCE } from '../scenarios';

// A dual-beam monitor's reference detector (the trace's `reference` column; analysis option
// lampReference, fit/lampReference.ts). The BBAR on level cuts, one chip, the lamp drifting −1 %/h
// with the chamber's detector noise (correlated 0.06 % over 1 s + white 0.03 % of full scale) and
// nothing else: the lamp is the one effect the reference speaks to. (With every chamber effect,
// scenario 'real chamber, BBAR, lamp reference', the ramp and the rest are left.)
const LAMP_AND_NOISE: ChamberOptions = {
  rateNmPerS: { H: 0.25, L: 0.5 }, whiteNoise: 0.0003, correlatedNoise: { fraction: 0.0006, correlationS: 1 }, lampDriftPerHour: -0.01, reference: LAMP_REFERENCE,
};
const SEEDS = [21, 22, 23];

async function analyse(run: ChamberRun): Promise<AnalysisResult> {
  const design = parseDesign(bbarDesign(), 'bbar.json');
  const trace = await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
  // The lamp alone: the start-up on level cuts, on by default with a reference column, held off
  // (this simulator's rate has no ramp; with it on, seed 22 keeps a false delay of 0.78 ± 0.38 s
  // and its layer 2 of 0.41 QWOT goes −1.03 → −2.00 % in n·d, cut 0.82 % QWOT; over seeds 21–36 the
  // thin layers' RMS 0.82 → 0.90 %, max 2.30 % either way, the rest unchanged).
  return analyzeRun(design, trace, { mode: 'refit', levelStartTransient: false });
}

/**
 * Seeds SEEDS with the real chamber's ramp (rate·(1 − e^(−t/1.5 s))), the lamp and the noise,
 * analysed in `mode` at the defaults (where the start-up must be found on every layer) and with
 * `off`: the layers' errors of each.
 */
async function withRampAndWithout(mode: 'refit' | 'sequential', off: AnalyzeOptions) {
  const design = parseDesign(bbarDesign(), 'bbar.json');
  const withIt = [], without = [];
  for (const seed of SEEDS) {
    const run = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, rampS: 1.5, seed });
    const trace = await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
    const a = await analyzeRun(design, trace, { mode });
    expect(a.warnings.some((w) => w.startsWith('start transient:') && w.includes('every layer fitted with it'))).toBe(true);
    withIt.push(...layerErrors(seed, a, run.truth.layers));
    without.push(...layerErrors(seed, await analyzeRun(design, trace, { mode, ...off }), run.truth.layers));
  }
  return { s: summarize(withIt), s0: summarize(without) };
}

describe('the lamp reference column', () => {
  it("the simulator's reference reads the lamp through its own gain and noise, and leaves the signal's draws as they were", () => {
    const withRef = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, seed: 21 });
    const without = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, reference: undefined, seed: 21 });
    expect(Array.from(withRef.signal)).toEqual(Array.from(without.signal));
    expect(chamberCsv(without).split('\n', 1)[0]).toBe('time_s,signal,layer,chip');
    expect(chamberCsv(withRef).split('\n', 1)[0]).toBe('time_s,signal,layer,chip,reference');
    // reference = 0.8·(1 − 0.01·t/3600)·(1 + 0.0003·g): the ratio's mean and scatter
    const n = withRef.reference!.length, dt = withRef.sampleIntervalS;
    let sum = 0, ss = 0;
    for (let i = 0; i < n; i++) {
      const e = withRef.reference![i] / (0.8 * (1 - (0.01 * i * dt) / 3600)) - 1;
      sum += e;
      ss += e * e;
    }
    expect(Math.abs(sum / n)).toBeLessThan(4 * (0.0003 / Math.sqrt(n)));
    expect(Math.sqrt(ss / n)).toBeGreaterThan(0.00027);
    expect(Math.sqrt(ss / n)).toBeLessThan(0.00033);
  });

  it("the modelled reading is in the trace's units: the lamp put back as the reference read it", { timeout: 300_000 }, async () => {
    const run = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, seed: 21 });
    const design = parseDesign(bbarDesign(), 'bbar.json');
    const trace = await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: design.layers.length });
    const { model } = await analyzeRun(design, trace, { mode: 'refit', modelSeries: true });
    // the mean misfit over the first and the last layer, against the lamp's drift between them
    // (−1 %/h over about 10 minutes: 0.17 % of the reading)
    const meanMisfit = (layer: number) => {
      let sum = 0, count = 0;
      for (let i = 0; i < run.signal.length; i++) {
        if (run.layer[i] !== layer || Number.isNaN(model![i])) continue;
        sum += (run.signal[i] - model![i]) / model![i];
        count++;
      }
      return sum / count;
    };
    const first = meanMisfit(1), last = meanMisfit(4);
    // Measured: −0.004 % and 0.001 %; with the model left in the divided signal's units 0.098 % and −0.087 %.
    expect(Math.abs(first)).toBeLessThan(3e-4);
    expect(Math.abs(last)).toBeLessThan(3e-4);
  });

  it('refit: within the chamber targets (thickness 0.5 %, index 0.005, 3σ coverage 95 %) with it, and not once it is dropped', { timeout: 300_000 }, async () => {
    const withRef = [], dropped = [];
    for (const seed of SEEDS) {
      const run = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, seed });
      const a = await analyse(run);
      expect(a.warnings[0]).toMatch(/^signal divided by the lamp reference column/);
      withRef.push(...layerErrors(seed, a, run.truth.layers));
      // the same run, its reference column not written
      const b = await analyse({ ...run, columns: { ...run.columns, reference: false } });
      dropped.push(...layerErrors(seed, b, run.truth.layers));
    }
    const s = summarize(withRef), s0 = summarize(dropped);
    // Measured (seeds 21–23): with it thickness 0.15 %, index 0.0019, coverage 100 %; dropped 2.3 %, 0.029.
    expect(s.maxThicknessPct).toBeLessThanOrEqual(CHAMBER_TARGETS.thicknessPct);
    expect(s.maxIndex).toBeLessThanOrEqual(CHAMBER_TARGETS.index);
    for (const v of Object.values(s.coverage)) expect(v!).toBeGreaterThanOrEqual(CHAMBER_TARGETS.coverage!);
    expect(misses(s, CHAMBER_TARGETS)).toEqual([]);
    expect(s0.maxIndex).toBeGreaterThan(CHAMBER_TARGETS.index);
    expect(s0.maxThicknessPct).toBeGreaterThan(CHAMBER_TARGETS.thicknessPct);
  });

  it('refit: a mains ripple the lock-in leaves, aliased into a 20 s beat, divided out with the reference smoothed over a window that follows it', { timeout: 300_000 }, async () => {
    // 0.2 % at 100.05 Hz, read every 0.1 s: a 0.05 Hz beat in both detectors. Over the 20 s window
    // used before the beat averaged out of the reference and stayed whole in the ratio (measured,
    // seeds 21–23: thickness 0.72 %, index 0.0061, thin layers 1.27 %; sequential 1.06 %, 0.0077).
    const withIt = [];
    for (const seed of SEEDS) {
      const run = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, lampRipple: { fraction: 0.002, frequencyHz: 100.05 }, seed });
      const a = await analyse(run);
      expect(a.warnings[0]).toMatch(/^signal divided by the lamp reference column \(its 2 s running mean/);
      withIt.push(...layerErrors(seed, a, run.truth.layers));
    }
    // Measured (seeds 21–23): thickness 0.16 %, index 0.0020, thin layers 1.04 %, coverage 100 %.
    const s = summarize(withIt);
    expect(misses(s, CHAMBER_TARGETS)).toEqual([]);
  });

  it("refit: the rate's start-up as the shutter opens found on the level cuts by itself, the index within 0.005 with it and not without", { timeout: 300_000 }, async () => {
    // The ramp of the real chamber (rate·(1 − e^(−t/1.5 s)): an effective start delay of 1.5 s) with
    // the lamp and the noise: each layer's own start-up read as a slower rate and a higher index.
    const { s, s0 } = await withRampAndWithout('refit', { levelStartTransient: false });
    // Measured (seeds 21–23): index 0.0015 with it (δ̂ 1.31, 2.27, 1.17 s), 0.0058 without; coverage 100 %.
    expect(s.maxIndex).toBeLessThanOrEqual(CHAMBER_TARGETS.index);
    expect(s0.maxIndex).toBeGreaterThan(CHAMBER_TARGETS.index);
    for (const v of Object.values(s.coverage)) expect(v!).toBeGreaterThanOrEqual(CHAMBER_TARGETS.coverage!);
  });

  it("sequential: each level cut's own fit on the start-up's clock (option sequentialLevelClock, on with a reference column), the index within 0.005 and thin layers within 1.5 % with it and not on real time", { timeout: 300_000 }, async () => {
    // The ramp, the lamp and the noise as above; in sequential each layer's law d = r·τ + a·τ²/2 on
    // real time starts at the logged start and takes the start-up's lag into its rate and end.
    const { s, s0 } = await withRampAndWithout('sequential', { sequentialLevelClock: false });
    // Measured (seeds 21–23): with it thickness 0.77 %, index 0.0037, thin layers 0.97 % (layer 1
    // −0.34 to +0.27 %); on real time 2.87 %, 0.0071, 2.10 % (layer 1 −1.09 to −0.51 %).
    expect(s.maxIndex).toBeLessThanOrEqual(CHAMBER_TARGETS.index);
    expect(s.maxThinOpticalPct).toBeLessThanOrEqual(CHAMBER_TARGETS.thinOpticalPct);
    expect(s.maxThicknessPct).toBeLessThan(1);
    expect(s0.maxIndex).toBeGreaterThan(CHAMBER_TARGETS.index);
    expect(s0.maxThinOpticalPct).toBeGreaterThan(CHAMBER_TARGETS.thinOpticalPct);
    for (const v of Object.values(s.coverage)) expect(v!).toBeGreaterThanOrEqual(CHAMBER_TARGETS.coverage!);
  });

  it('the stray light no dark reading and no layer of the chip can tell is in every index σ (option unmeasuredOffsetSigma)', { timeout: 300_000 }, async () => {
    // Stray light of 0.5 % of full scale (the simulator's 'T monitoring with stray light'), the same
    // draws with none: what the offset taken as 0 costs each index, against the σ reported. The
    // BBAR's four layers leave the offset's fit at σ ≈ 2 % of full scale, so it stays at 0.
    const design = parseDesign(bbarDesign(), 'bbar.json');
    const analyse = async (run: ChamberRun) => analyzeRun(design, await readTrace(chamberCsvChunks(run), { fileName: 'bbar.csv', layerCount: 4 }), { mode: 'refit' });
    const shifts: { z: number; ownZ: number }[] = [];
    for (const seed of [21, 22]) {
      const run = simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, strayFraction: 0.005, seed });
      const [stray, none] = [await analyse(run), await analyse(simulateChamberRun(bbarDesign(), { ...LAMP_AND_NOISE, seed }))];
      expect(stray.chips[0].offset).toBe(0);
      for (const t of run.truth.layers.filter((x) => x.qwotAtMonitor >= 0.5)) {
        const [a, b] = [stray.layers.find((l) => l.layer === t.layer)!, none.layers.find((l) => l.layer === t.layer)!];
        shifts.push({ z: Math.abs(a.index - b.index) / a.indexSigma, ownZ: Math.abs(a.index - t.index) / a.indexSigma });
      }
    }
    // Measured: the stray light moves layer 3's index (1.95 QWOT) by −0.0032, z 1.5 against σ_n
    // 0.0021 (layer 4: +0.0019, z 0.5); with the offset taken as exact (option at 0, σ_n 0.0007–0.0008)
    // z 4.1–4.3, and the truth 4.4σ off on seed 21.
    for (const s of shifts) {
      expect(s.z).toBeLessThan(2);
      expect(s.ownZ).toBeLessThan(3);
    }
  });
});

