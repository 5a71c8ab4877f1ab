import { describe, expect, it } from 'vitest';
import { stackRT } from '@/tests/chamber/thinFilm';
import { gaussian } from '../../trace/__tests__/rng';
import { type FitLayerData } from '../layerModel';
import { pooledStartDelay, startDelayProfile, START_DELAY_GRID_S } from '../startDelay';
import { exposureTime, exposureTimes, onsetFraction, realTime } from '../startTransient';
import { binMeans } from '../subsample';

describe('the exposure clock of a linear onset', () => {
  // Textbook calculus: ∫₀^τ t/(2δ) dt = τ²/(4δ) while the ramp lasts (τ < 2δ), then the full rate:
  // E(τ) = δ + (τ − 2δ) = τ − δ. With δ = 1 s: E(1) = 1/4, E(2) = 1, E(5) = 4.
  it('has the closed-form integral of the ramp', () => {
    expect(exposureTime(1, 1)).toBeCloseTo(0.25, 12);
    expect(exposureTime(2, 1)).toBeCloseTo(1, 12);
    expect(exposureTime(5, 1)).toBeCloseTo(4, 12);
    expect(exposureTime(0, 1)).toBe(0);
    expect(exposureTime(3, 0)).toBe(3);
  });

  it('is the integral of the onset fraction (midpoint rule, 10⁵ steps)', () => {
    const delay = 0.7, tau = 4.3, steps = 100_000, h = tau / steps;
    let sum = 0;
    for (let i = 0; i < steps; i++) sum += onsetFraction((i + 0.5) * h, delay) * h;
    expect(sum).toBeCloseTo(exposureTime(tau, delay), 6);
    // The deficit τ − E(τ) after the onset is the delay itself: ∫(1 − s) = ½·2δ·1.
    expect(tau - exposureTime(tau, delay)).toBeCloseTo(delay, 12);
  });

  it('goes back to real time exactly, on and after the ramp', () => {
    for (const tau of [0, 0.1, 0.9, 1.4, 1.6, 10]) expect(realTime(exposureTime(tau, 0.8), 0.8)).toBeCloseTo(tau, 12);
    expect(Array.from(exposureTimes([0, 2, 4], 1))).toEqual([0, 1, 3]);
  });
});

describe('the run-wide start delay pooled from the layers', () => {
  const grid = START_DELAY_GRID_S;
  const parabola = (centre: number, sigma: number) => ({ chi2: Float64Array.from(grid, (d) => ((d - centre) ** 2 - centre ** 2) / sigma ** 2), points: 100 });

  it('finds the minimum and the σ of a sum of parabolas (weighted mean, 1/σ² = Σ 1/σ_j²)', () => {
    const p = pooledStartDelay([parabola(1.2, 0.5), parabola(1.2, 0.5), parabola(1.2, 1)])!;
    expect(p.delayS).toBeCloseTo(1.2, 6);
    expect(p.sigmaS).toBeCloseTo(1 / Math.sqrt(4 + 4 + 1), 6);
    expect(p.kept).toBe(true);
  });

  it('widens σ by the Birge ratio when the layers disagree', () => {
    const agree = pooledStartDelay([parabola(1, 0.2), parabola(1, 0.2)])!;
    const disagree = pooledStartDelay([parabola(0.5, 0.2), parabola(1.5, 0.2)])!;
    expect(disagree.delayS).toBeCloseTo(1, 6);
    expect(disagree.sigmaS).toBeGreaterThan(2 * agree.sigmaS);
  });

  it('keeps no delay the data do not ask for (Schwarz: the χ² gain must exceed ln N)', () => {
    // χ² lower by (0.3/0.3)² = 1 at 0.3 s, under ln(300) ≈ 5.7.
    const weak = pooledStartDelay([parabola(0.3, 0.3), parabola(0.3, 0.3 * Math.sqrt(2) * 1e6), parabola(0.3, 1e6)])!;
    expect(weak.marginChi2).toBeCloseTo(Math.log(300), 12);
    expect(weak.kept).toBe(false);
    expect(pooledStartDelay([parabola(-0.5, 0.3)])!.kept).toBe(false);
    expect(pooledStartDelay([])).toBeNull();
  });
});

// An H quarter-wave (n = 2.3, 0.25 nm/s) on glass at 600 nm, its rate rising as a raised cosine over the
// first W s, s(τ) = (1 − cos(πτ/W))/2: thickness r·(τ/2 − W/(2π)·sin(πτ/W)) on the onset, r·(τ − W/2)
// after (textbook calculus): a shape other than the fit's linear ramp, with the same kind of deficit
// δ = W/2. Transmittance from the chamber simulator's own matrices (tests/chamber/thinFilm.ts).
describe("one layer's profile in the start delay", () => {
  const media = { ambient: 1, substrate: 1.52, backside: true };
  const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: 600, mode: 'T' as const };
  const rate = 0.25, dt = 0.1, n = 2609;

  function profileOf(onsetS: number, seed: number) {
    const g = gaussian(seed);
    const tau = Float64Array.from({ length: n }, (_, i) => i * dt);
    const d = (t: number) => (t >= onsetS ? rate * (t - onsetS / 2) : rate * (t / 2 - (onsetS / (2 * Math.PI)) * Math.sin((Math.PI * t) / onsetS)));
    const y = Float64Array.from(tau, (t) => stackRT([{ n: 2.3, k: 0, thicknessNm: d(t) }], 600, media).T + 0.0005 * g());
    const indices = Int32Array.from(tau, (_, i) => i);
    const layer: FitLayerData = {
      optics, nominalAt: () => ({ re: 2.3, im: 0 }), tauS: tau, y, durationS: tau[n - 1], extinction: 0,
      heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
    };
    return startDelayProfile({
      below: [], start: { index: 2.3, rateNmPerS: rate, rateDriftNmPerS2: 0, gain: 1 }, offsetSignal: 0,
      dataAt: (delayS) => {
        const b = binMeans(tau, indices, y, 300, exposureTimes(tau, delayS));
        return { ...layer, tauS: b.tauS, y: b.y, durationS: exposureTime(tau[n - 1], delayS) };
      },
    })!;
  }

  it('finds the deficit of an onset of another shape', () => {
    const found = pooledStartDelay([profileOf(3, 1), profileOf(3, 2), profileOf(3, 3)])!;
    expect(found.kept).toBe(true);
    expect(Math.abs(found.delayS - 1.5)).toBeLessThan(Math.max(3 * found.sigmaS, 0.1));
    expect(found.sigmaS).toBeLessThan(0.5);
  });

  it('finds none in a layer that starts at its full rate', () => {
    const none = pooledStartDelay([profileOf(1e-9, 4), profileOf(1e-9, 5), profileOf(1e-9, 6)])!;
    expect(none.kept).toBe(false);
    expect(none.delayS).toBeLessThan(3 * none.sigmaS);
  });
});
