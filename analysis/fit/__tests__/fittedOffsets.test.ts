import { describe, expect, it } from 'vitest';
import { analyzeRun } from '..';
import { type ChipCalibration } from '../calibrateChip';
import { shareDarkReadings, type ChipStart } from '../chipCalibrations';
import { betweenChipSigma, pool } from '../fittedOffsets';
import { createRng } from '../../synth';
import { mirror18, synthTrace } from './scenarios';

describe('pool (offsets of several chips)', () => {
  it('is the inverse-variance weighted mean with σ = 1/√Σw when the values agree, and nothing when they do not', () => {
    // Weighted mean of measurements with their σ: J. R. Taylor, An Introduction to Error
    // Analysis, 2nd ed., §7.2 (from memory): x̄ = Σwᵢxᵢ/Σwᵢ, wᵢ = 1/σᵢ², σ = 1/√Σwᵢ.
    const p = pool([{ offset: 1, sigma: 1 }, { offset: 3, sigma: 1 }]);
    expect(p!.offset).toBeCloseTo(2, 12);
    expect(p!.sigma).toBeCloseTo(Math.SQRT1_2, 12);
    const q = pool([{ offset: 1, sigma: 0.5 }, { offset: 2, sigma: 1 }]);
    expect(q!.offset).toBeCloseTo((4 * 1 + 1 * 2) / 5, 12);
    expect(pool([{ offset: 0, sigma: 0.1 }, { offset: 1, sigma: 0.1 }])).toBeNull();
    expect(pool([])).toBeNull();
  });
});

describe('betweenChipSigma (the chips\' offsets scattered beyond their σ)', () => {
  // DerSimonian–Laird's moment estimator (R. DerSimonian, N. Laird, Controlled Clinical Trials 7,
  // 177–188 (1986), eq. for τ², from memory): τ² = max(0, (Q − (k − 1))/(Σw − Σw²/Σw)),
  // Q = Σwᵢ(xᵢ − x̄)². By hand: xᵢ = ±3, σᵢ = 1: Q = 18, τ² = 17/(2 − 1) = 17.
  it('is √17 for two chips at ±3 with σ 1, and 0 where they agree or there is one', () => {
    expect(betweenChipSigma([{ offset: -3, sigma: 1 }, { offset: 3, sigma: 1 }])).toBeCloseTo(Math.sqrt(17), 12);
    expect(betweenChipSigma([{ offset: 0.5, sigma: 1 }, { offset: -0.5, sigma: 1 }])).toBe(0);
    expect(betweenChipSigma([{ offset: 7, sigma: 1 }])).toBe(0);
  });
  it('recovers a between-chip spread of 2 from 400 chips drawn with σ 1 (within 10 %)', () => {
    const rng = createRng(3);
    const fits = Array.from({ length: 400 }, () => ({ offset: 2 * rng.normal() + rng.normal(), sigma: 1 }));
    expect(betweenChipSigma(fits)).toBeGreaterThan(1.8);
    expect(betweenChipSigma(fits)).toBeLessThan(2.2);
  });
});

function chip(chip: number, offset: number, offsetSigma: number, offsetSource: ChipCalibration['offsetSource'] = 'dark'): ChipStart {
  const M0 = 0.93, gain = 1, bareLevel = gain * M0 + offset;
  return {
    startS: 100 * chip, wavelengthNm: 600, mode: 'T', modelledBare: M0,
    calibration: {
      chip, gain, gainSigma: 1e-4, offset, offsetSigma, offsetSource, source: 'bare-chip', bareSamples: 200, darkSamples: offsetSource === 'dark' ? 5 : 0,
      otherSamples: 0, noiseSigma: 6e-4, bareLevel,
    },
  };
}

describe('shareDarkReadings (the dark readings of a run belong to its detector)', () => {
  it('gives every chip the weighted mean of the agreeing readings, leaves out an odd one with a warning, and serves a chip without one', () => {
    const chips = new Map([chip(1, 0, 0, 'assumed'), chip(2, 0.0036, 0.0006), chip(3, 0.0024, 0.0006), chip(4, 0.03, 0.0006), chip(5, 0.003, 0.0006)].map((c) => [c.calibration.chip, c]));
    const bare = new Map([...chips].map(([k, c]) => [k, c.calibration.bareLevel!]));
    const warnings: string[] = [];
    shareDarkReadings(chips, warnings);
    for (const [k, c] of chips) {
      expect(c.calibration.offset).toBeCloseTo(0.003, 12);
      expect(c.calibration.offsetSigma).toBeCloseTo(0.0006 / Math.sqrt(3), 12);
      // The gain follows: (bare reading − offset)/M₀.
      expect(c.calibration.gain).toBeCloseTo((bare.get(k)! - 0.003) / 0.93, 12);
    }
    expect(chips.get(1)!.calibration.offsetSource).toBe('other-chips');
    expect(chips.get(4)!.calibration.offsetSource).toBe('other-chips');
    expect(chips.get(2)!.calibration.offsetSource).toBe('dark');
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatch(/chip 4: its dark reading 0.0300 disagrees/);
  });

  it('keeps each chip its own reading when precise readings disagree (the offset moved during the run)', () => {
    const chips = new Map([chip(1, 0.003, 0.0001), chip(2, 0.0045, 0.0001)].map((c) => [c.calibration.chip, c]));
    shareDarkReadings(chips, []);
    expect(chips.get(1)!.calibration.offset).toBe(0.003);
    expect(chips.get(2)!.calibration.offset).toBe(0.0045);
  });
});

describe('an offset fitted in transmittance', () => {
  it('finds a 0.5 % stray-light offset from each chip\'s six layers, pooled over the chips, with σ, and the thicknesses improve on an assumed zero', async () => {
    const design = mirror18();
    const { run, trace } = await synthTrace(design, { seed: 43, offset: 0.005, noiseFraction: 0.0005 });
    const fitted = await analyzeRun(design, trace);
    const assumed = await analyzeRun(design, trace, { fitOffset: false });
    for (const c of fitted.chips) {
      // averaged with the zero assumed (option offsetAveraging), the fit, about 3σ out, mostly taken (measured 0.91; 0.98
      // while a false start delay of 0.12 s was kept, a parabola's vertex inside the delay grid's first step)
      expect(c.offsetSource).toBe('averaged');
      expect(c.offsetWeight).toBeGreaterThan(0.9);
      expect(Math.abs(c.offset - 0.005)).toBeLessThan(3 * c.offsetSigma);
      // σ: the pooled profile's and the systematic 0.15 % of full scale, in quadrature.
      expect(c.offsetSigma).toBeGreaterThan(0.0015);
      expect(c.offsetSigma).toBeLessThan(0.002);
    }
    const worst = (r: typeof fitted) => Math.max(...r.layers.map((l) => Math.abs(l.index - run.truth[l.layer - 1].index)));
    expect(worst(fitted)).toBeLessThan(0.5 * worst(assumed));
  });
});

describe('the offset\'s σ carried into the layers (refit)', () => {
  it('widens each layer\'s σ by its sensitivity to the offset, so the truth lies within 3σ where an exact offset was assumed before', async () => {
    const design = mirror18();
    const { run, trace } = await synthTrace(design, { seed: 44, offset: 0.005, noiseFraction: 0.0005 });
    const r = await analyzeRun(design, trace, { mode: 'refit' });
    const z = r.layers.map((l) => Math.abs(l.index - run.truth[l.layer - 1].index) / l.indexSigma);
    // Without the offset's σ (the fit taking the fitted offset as exact) the worst layer here
    // is at 7σ.
    expect(Math.max(...z)).toBeLessThan(3);
  });
});
