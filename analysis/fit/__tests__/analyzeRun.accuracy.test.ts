import { describe, expect, it } from 'vitest';
import { analyzeRun, type AnalysisResult } from '..';
import { type SynthRun } from '../../synth';
import { bbar4, mirror18, synthTrace } from './scenarios';

// Issue 4 accuracy targets on synthetic data with 0.1 % noise (σ = 0.001 of full scale, 10 Hz):
// thickness within 0.3 % and index within 0.003 for layers of at least 0.5 QWOT, optical
// thickness within 1 % for thinner ones, cut error within 0.5 % QWOT.
const FAULTS = { rateNmPerS: { H: 0.25, L: 0.5 }, rateDriftFraction: 0.04, indexDriftPerHour: { H: -0.02 }, indexOffset: { L: -0.004 } };

interface Errors {
  layer: number;
  qwot: number;
  thicknessPct: number;
  opticalPct: number;
  index: number;
  cutQwotPct: number;
  /** |thickness error| / σ. */
  z: number;
}

function errors(result: AnalysisResult, run: SynthRun): Errors[] {
  return result.layers.map((l) => {
    const t = run.truth[l.layer - 1];
    return {
      layer: l.layer,
      qwot: t.qwotAtMonitor,
      thicknessPct: (l.thicknessNm / t.thicknessNm - 1) * 100,
      opticalPct: ((l.index * l.thicknessNm) / (t.index * t.thicknessNm) - 1) * 100,
      index: l.index - t.index,
      cutQwotPct: l.cutErrorQwotPct - t.cutErrorQwotPct,
      z: Math.abs(l.thicknessNm - t.thicknessNm) / l.thicknessSigmaNm,
    };
  });
}

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length);

function table(title: string, seq: Errors[], ref: Errors[]): void {
  const f = (v: number, d = 3) => v.toFixed(d).padStart(8);
  const rows = seq.map((s, i) => {
    const r = ref[i];
    return `${String(s.layer).padStart(3)} ${f(s.qwot, 2)} | ${f(s.thicknessPct)} ${f(s.index, 4)} ${f(s.cutQwotPct)} | ${f(r.thicknessPct)} ${f(r.index, 4)} ${f(r.cutQwotPct)}`;
  });
  console.log(
    `${title}\nlayer  QWOT |  sequential: d err %  n err  cut err %QW |  refit: d err %  n err  cut err %QW\n${rows.join('\n')}\n` +
      `RMS        | ${f(rms(seq.map((e) => e.thicknessPct)))} ${f(rms(seq.map((e) => e.index)), 4)} ${f(rms(seq.map((e) => e.cutQwotPct)))} | ` +
      `${f(rms(ref.map((e) => e.thicknessPct)))} ${f(rms(ref.map((e) => e.index)), 4)} ${f(rms(ref.map((e) => e.cutQwotPct)))}`,
  );
}

function expectWithinTargets(e: Errors[]): void {
  for (const x of e) {
    if (x.qwot >= 0.5) {
      expect(Math.abs(x.thicknessPct), `layer ${x.layer} thickness`).toBeLessThan(0.3);
      expect(Math.abs(x.index), `layer ${x.layer} index`).toBeLessThan(0.003);
    } else {
      expect(Math.abs(x.opticalPct), `layer ${x.layer} optical thickness`).toBeLessThan(1);
    }
    expect(Math.abs(x.cutQwotPct), `layer ${x.layer} cut error`).toBeLessThan(0.5);
  }
}

describe('analyzeRun accuracy on synthetic traces (issue 4 targets)', () => {
  it('18-layer mirror, chip change every 6 layers, rate and index drift: refit meets the targets and beats sequential', { timeout: 240_000 }, async () => {
    const design = mirror18();
    for (const seed of [11, 12, 13]) {
      const { run, trace } = await synthTrace(design, { seed, ...FAULTS });
      const seq = errors(await analyzeRun(design, trace, { mode: 'sequential' }), run);
      const ref = errors(await analyzeRun(design, trace, { mode: 'refit' }), run);
      table(`mirror18 seed ${seed}`, seq, ref);
      expectWithinTargets(ref);
      expect(rms(ref.map((x) => x.thicknessPct))).toBeLessThan(rms(seq.map((x) => x.thicknessPct)));
      expect(rms(ref.map((x) => x.cutQwotPct))).toBeLessThan(rms(seq.map((x) => x.cutQwotPct)));
    }
  });

  it('four-layer BBAR cut on level, thin layers held where the data cannot separate index and thickness: refit meets the targets', { timeout: 120_000 }, async () => {
    const design = bbar4();
    for (const seed of [11, 12, 13]) {
      const { run, trace } = await synthTrace(design, { seed, ...FAULTS });
      const result = await analyzeRun(design, trace, { mode: 'refit' });
      const seq = errors(await analyzeRun(design, trace, { mode: 'sequential' }), run);
      const ref = errors(result, run);
      table(`bbar4 seed ${seed}`, seq, ref);
      expectWithinTargets(ref);
      // The 0.22-QWOT layer's index does not separate from its thickness (trial fit correlation
      // ≈ −1): held, and its note says why; the 0.4-QWOT one separates at 0.1 % noise: fitted.
      expect(result.layers[0].indexHeld).toBe(true);
      expect(result.layers[0].warnings.some((w) => w.startsWith('index held') && w.includes('a free fit of this layer finds index and thickness correlated at'))).toBe(true);
      expect(result.layers[1].indexHeld || result.layers[2].indexHeld || result.layers[3].indexHeld).toBe(false);
      expect(result.layers[1].indexSigma).toBeLessThan(0.01);
    }
  });

  it('uncertainties are sane: the truth lies within 3σ for at least 90 % of layers', { timeout: 240_000 }, async () => {
    const design = mirror18();
    const z: number[] = [];
    for (const seed of [21, 22, 23, 24]) {
      const { run, trace } = await synthTrace(design, { seed, ...FAULTS });
      z.push(...errors(await analyzeRun(design, trace, { mode: 'refit' }), run).map((e) => e.z));
    }
    const inside = z.filter((v) => v < 3).length / z.length;
    console.log(`refit thickness |error|/σ over ${z.length} layers: median ${[...z].sort((a, b) => a - b)[z.length >> 1].toFixed(2)}, within 3σ ${(inside * 100).toFixed(0)} %`);
    expect(inside).toBeGreaterThanOrEqual(0.9);
    // …and σ is not inflated beyond what the run leaves unknown (for Gaussian errors the median |z|
    // is 0.67). Measured: 0.23 (0.47 while the generator cut turning-point layers at the design's
    // thickness ±0.4 %, up to 1.2 % before the turning point, an error the analysis does not model;
    // cut past the turning point the errors are about a third smaller and σ 10–25 % wider, the
    // signal flat at the end). What stays wide is the detector offset's σ, profiled from the layers
    // without a dark reading: the second-to-last layer of each chip, σ 0.38–0.44 % for errors
    // within 0.08 % (DEVELOPERS.md, fit/offsetSigma.ts). 0.207 → 0.198 since each chip's last layer
    // takes its overshoot from the run's other cuts (option overshootPopulation): on these seeds
    // those layers' errors fell (RMS 0.068 → 0.046 %, median |z| 0.19 → 0.12), their σ hardly (its
    // shares of the offset and the stack below move the end and its turning point together).
    expect([...z].sort((a, b) => a - b)[z.length >> 1]).toBeGreaterThan(0.18);
  });
});
