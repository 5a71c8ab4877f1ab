import { describe, expect, it } from 'vitest';
import { randomEffectsMean } from '../fittedOffsets';
import { averagedOffset } from '../offsetAveraging';

// The model-averaged estimate and variance of Buckland, Burnham and Augustin (Biometrics 53, 603–618
// (1997), from memory): ō = Σ wᵢoᵢ, σ² = Σ wᵢ(σᵢ² + (oᵢ − ō)²), here with weights exp(−IC/2) and
// Hannan–Quinn's penalty 2·ln ln n; the figures below worked by hand from those formulas.
describe('averagedOffset (the assumed offset and the fitted one, weighed by their evidence)', () => {
  it('takes a fit 3σ out at n = exp(e²) (penalty 4) with w = 1/(1 + e^−2.5) = 0.9241, its spread in σ', () => {
    const a = averagedOffset({ offset: 0, sigma: 0, sigmaRandom: 0 }, { offset: 3, sigma: 1, sigmaRandom: 0.5 }, Math.exp(Math.E ** 2));
    expect(a.weight).toBeCloseTo(0.92414, 4);
    expect(a.offset).toBeCloseTo(2.77243, 4);
    // σ² = 0.92414·1 + 0.92414·0.07586·9 = 1.55510; the random part 0.92414·0.25 + 0.63096 = 0.86200
    expect(a.sigma).toBeCloseTo(Math.sqrt(1.5551), 3);
    expect(a.sigmaRandom).toBeCloseTo(Math.sqrt(0.862), 3);
  });
  it('leaves a fit that agrees with the assumed offset where it is, σ the two models\' mixed', () => {
    const a = averagedOffset({ offset: 2, sigma: 0.3, sigmaRandom: 0.3 }, { offset: 2, sigma: 1, sigmaRandom: 1 }, Math.exp(Math.E ** 2));
    // w = 1/(1 + e²) = 0.11920
    expect(a.weight).toBeCloseTo(0.1192, 4);
    expect(a.offset).toBe(2);
    expect(a.sigma).toBeCloseTo(Math.sqrt(0.8808 * 0.09 + 0.1192), 4);
  });
  it('gives a fit with no σ no weight', () => {
    expect(averagedOffset({ offset: 0, sigma: 0, sigmaRandom: 0 }, { offset: 1, sigma: Infinity, sigmaRandom: Infinity }, 1000).offset).toBe(0);
  });
});

describe('randomEffectsMean (chips that disagree, one detector offset)', () => {
  it('weighs by 1/(σ² + τ²): ±3 with σ 1 (τ² = 17) give 0 ± 3; 0, 3, 3 (τ² = 2) give 2 ± 1', () => {
    const two = randomEffectsMean([{ offset: -3, sigma: 1 }, { offset: 3, sigma: 1 }]);
    expect(two.offset).toBeCloseTo(0, 12);
    expect(two.sigma).toBeCloseTo(3, 12);
    const three = randomEffectsMean([{ offset: 0, sigma: 1 }, { offset: 3, sigma: 1 }, { offset: 3, sigma: 1 }]);
    expect(three.offset).toBeCloseTo(2, 12);
    expect(three.sigma).toBeCloseTo(1, 12);
  });

  it('is the inverse-variance pool where the chips scatter no more than their σ (Cochran\'s Q ≤ k − 1, τ = 0)', () => {
    // 1 ± 1 and 2 ± 1: Q = 0.5 on 1 degree of freedom, the pool 1.5 ± 1/√2
    const p = randomEffectsMean([{ offset: 1, sigma: 1 }, { offset: 2, sigma: 1 }]);
    expect(p.offset).toBeCloseTo(1.5, 12);
    expect(p.sigma).toBeCloseTo(Math.SQRT1_2, 12);
  });

  it('three chips each within 3σ of their pool but scattered beyond their σ (fit/fittedOffsets.ts pools them so)', () => {
    // Offsets fitted on a 1 Hz real-chamber mirror (tests/chamber/__tests__/slowLogger.test.ts, seed
    // 22): the pool is 0.00761 ± 0.00072, each chip within 2.8σ of it, but Q = 18.8 on 2 degrees of
    // freedom; DerSimonian–Laird's τ = 0.00431 (hand-computed from their formula) widens it.
    const fits = [{ offset: 0.00393, sigma: 0.00157 }, { offset: 0.00961, sigma: 0.00086 }, { offset: 0.00112, sigma: 0.00231 }];
    const r = randomEffectsMean(fits);
    expect(r.offset).toBeCloseTo(0.005181, 5);
    expect(r.sigma).toBeCloseTo(0.002664, 5);
  });
});
