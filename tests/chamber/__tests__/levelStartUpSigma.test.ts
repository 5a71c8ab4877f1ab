import { describe, expect, it } from 'vitest';
import { unresolvedLevelDelaySigma } from '@/analysis/fit/startDelay';
import { runScenario } from '../harness/runScenario';
import { scenarios } from '../scenarios';

// A run cut on level only, with option levelStartTransient off (the default): the level cuts are
// fitted at δ = 0 while the chamber's rate ramps up over 1.5 s as the shutter opens, and the δ the
// chips' joint profile allows goes into their σ (analysis/fit/analyzeRun.ts analyzeSignal). Before,
// that start-up was in no σ: on the simulator's real-chamber BBAR, refit, layer 2 (0.41 QWOT SiO₂)
// read its index +0.007 to +0.016 high at σ 0.003–0.004 on every seed of 21–40, past 3σ on five.
const SCENARIO = scenarios().find((s) => s.name === 'real chamber, BBAR')!;

describe('the level cuts\' unresolved start-up in their σ', () => {
  it('√(δ̂² + σ²) of a delay past 0; δ̂ alone without curvature; nothing at 0', () => {
    const p = { delayS: 1.2, sigmaS: 0.5, gainChi2: 3, dispersion: 1, marginChi2: 4, kept: false, layers: 1, shutterS: null };
    expect(unresolvedLevelDelaySigma(p)).toBeCloseTo(1.3, 12);
    expect(unresolvedLevelDelaySigma({ ...p, sigmaS: Infinity })).toBe(1.2);
    expect(unresolvedLevelDelaySigma({ ...p, delayS: 0 })).toBe(0);
  });

  it('real-chamber BBAR, refit, seeds 27 and 37: the same estimates as with no start-up considered, layer 2\'s index σ wider and within 3σ, and the note says so', { timeout: 240_000 }, async () => {
    for (const seed of [27, 37]) {
      const { run, results } = await runScenario(SCENARIO, seed, ['refit']);
      const plain = (await runScenario(SCENARIO, seed, ['refit'], { startTransient: false })).results.refit!;
      const result = results.refit!;
      expect(result.layers.map((l) => l.thicknessNm)).toEqual(plain.layers.map((l) => l.thicknessNm));
      expect(result.layers.map((l) => l.index)).toEqual(plain.layers.map((l) => l.index));
      const truth = run.truth.layers.find((t) => t.layer === 2)!;
      const [l2, was] = [result.layers.find((l) => l.layer === 2)!, plain.layers.find((l) => l.layer === 2)!];
      // measured: seed 27 3.84σ → 1.67σ, seed 37 3.9σ → 2.05σ (over seeds 21–40 one layer stayed past
      // 3σ: seed 32's, 4.52σ → 3.13σ). Since the growth after layer 1's cut, which the chip's joint
      // fit holds, is carried into layer 2's σ too (analysis/fit/heldGrowthSigma.ts), the plain fit's
      // layer 2 is within 3σ as well (2.17σ and 2.02σ, seed 32 2.09σ → 1.88σ); the start-up widens
      // its σ by 1.54× and 1.30×.
      expect(l2.indexSigma).toBeGreaterThan(1.2 * was.indexSigma);
      expect(Math.abs(l2.index - truth.index)).toBeLessThan(3 * l2.indexSigma);
      // the note says so (a note, not a warning: it does not flag the run, analysis/fit/analysisNotes.ts)
      const note = result.warnings.find((w) => w.startsWith('start transient:'));
      expect(note).toContain('not applied (option levelStartTransient off)');
      expect(note).toContain('carried into their σ');
    }
  });

  it('with option levelStartTransient, a delay not kept is carried, estimates unchanged, and the note gives √(δ̂² + σ²)', { timeout: 120_000 }, async () => {
    // the simulator's ramp off, seed 22: measured δ̂ 0.40 ± 0.43 s, not kept (χ² gain 0.9 under the margin of 1)
    const still = { ...SCENARIO, options: { ...SCENARIO.options, rampS: 0 } };
    const result = (await runScenario(still, 22, ['refit'], { levelStartTransient: true })).results.refit!;
    const plain = (await runScenario(still, 22, ['refit'], { startTransient: false })).results.refit!;
    expect(result.layers.map((l) => l.thicknessNm)).toEqual(plain.layers.map((l) => l.thicknessNm));
    expect(result.layers.every((l, j) => l.thicknessSigmaNm >= plain.layers[j].thicknessSigmaNm)).toBe(true);
    expect(result.layers.some((l, j) => l.indexSigma > 1.05 * plain.layers[j].indexSigma)).toBe(true);
    const note = result.warnings.find((w) => w.startsWith('start transient:'))!;
    const m = /opened ([\d.]+) ± ([\d.]+) s late.*not kept.*about 0, ([\d.]+) s, carried into their σ/.exec(note);
    expect(m).not.toBeNull();
    expect(Number(m![3])).toBeCloseTo(Math.hypot(Number(m![1]), Number(m![2])), 1);
  });
});
