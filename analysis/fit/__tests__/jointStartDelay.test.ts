import { describe, expect, it } from 'vitest';
import { stackRT, type FilmLayer } from '@/tests/chamber/thinFilm';
import { gaussian } from '../../trace/__tests__/rng';
import { fitLayers, type SharedGain } from '../fitLayers';
import { driftAtDelay, jointStartDelayProfile, pooledLevelDelay, type JointStartDelayProfile } from '../jointStartDelay';
import { type FitLayerData } from '../layerModel';
import { binsOnExposureClocks } from '../profileBins';
import { pooledStartDelay, START_DELAY_GRID_S } from '../startDelay';

// Two layers cut on level on one chip in transmittance at 520 nm (H 119 nm at 0.25 nm/s, L 91.5 nm
// at 0.5 nm/s, 10 s apart, on crown glass with its back face), each starting as a raised cosine over
// W = 3 s, s(τ) = (1 − cos(πτ/W))/2: thickness r·(τ/2 − W/(2π)·sin(πτ/W)) on the onset, r·(τ − W/2)
// after (textbook calculus), a shape other than the fit's linear ramp with the deficit δ = W/2 =
// 1.5 s; the lamp drifting −1 %/h, G(t) = 1 − t/360000. Transmittance from the chamber
// simulator's own matrices (tests/chamber/thinFilm.ts), white noise 0.05 % of full scale.
const WL = 520, dt = 0.1;
const media = { ambient: 1, substrate: 1.52, backside: true };
const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: WL, mode: 'T' as const };
const LAYERS = [{ n: 2.1, rate: 0.25, d: 119 }, { n: 1.46, rate: 0.5, d: 91.5 }];
const DRIFT_PER_S = -0.01 / 3600;

function chip(onsetS: number, driftPerS: number, seed: number) {
  const g = gaussian(seed);
  const below: FilmLayer[] = [];
  let t0 = 0;
  return LAYERS.map((L) => {
    const n = Math.round(L.d / L.rate / dt + (onsetS / 2) / dt);
    const tau = Float64Array.from({ length: n }, (_, i) => i * dt);
    const d = (t: number) => (onsetS <= 0 || t >= onsetS ? L.rate * (t - onsetS / 2) : L.rate * (t / 2 - (onsetS / (2 * Math.PI)) * Math.sin((Math.PI * t) / onsetS)));
    const y = Float64Array.from(tau, (t) => stackRT([...below, { n: L.n, k: 0, thicknessNm: d(t) }], WL, media).T * (1 + driftPerS * (t0 + t)) + 0.0005 * g());
    const data: FitLayerData = {
      optics, nominalAt: () => ({ re: L.n, im: 0 }), tauS: tau, y, durationS: tau[n - 1], extinction: 0,
      heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: t0,
    };
    const binsAt = binsOnExposureClocks(tau, Int32Array.from(tau, (_, i) => i), y, 300);
    below.push({ n: L.n, k: 0, thicknessNm: d(tau[n - 1]) });
    t0 += tau[n - 1] + 10;
    const real = binsAt(0);
    return { data: { ...data, tauS: real.tauS, y: real.y }, binsAt };
  });
}

function profileOf(onsetS: number, driftPerS: number, seed: number, fitDrift: boolean) {
  const layers = chip(onsetS, driftPerS, seed);
  const sharedGain: SharedGain = { gain: 1, driftPerS: 0, fitDrift, ...(fitDrift ? { driftPrior: { meanPerS: 0, sigmaPerS: 0.01 / 3600 } } : {}) };
  const start = fitLayers({
    fixedBelow: [], layers: layers.map((l) => l.data), offsetSignal: 0, sharedGain,
    start: LAYERS.map((L) => ({ index: L.n, rateNmPerS: L.rate, rateDriftNmPerS2: 0, gain: 1 })),
  });
  const profile = jointStartDelayProfile({
    layers: layers.map((l) => l.data), binsAt: layers.map((l) => l.binsAt), onClock: [true, true], start: start.layers,
    offsetSignal: 0, sharedGain: { ...sharedGain, gain: start.sharedGain!.gain, driftPerS: start.sharedGain!.driftPerS },
  });
  expect(profile).not.toBeNull();
  return pooledStartDelay([profile!])!;
}

describe("a chip's start delay profiled in its joint fit, the lamp drift refitted at every delay", () => {
  it('finds the deficit of an onset of another shape under a drifting lamp', () => {
    // Measured: 1.46 ± 0.33 and 1.49 ± 0.32 s.
    for (const seed of [1, 2]) {
      const found = profileOf(3, DRIFT_PER_S, seed, true);
      expect(found.kept).toBe(true);
      expect(Math.abs(found.delayS - 1.5)).toBeLessThan(3 * found.sigmaS);
      expect(found.sigmaS).toBeLessThan(0.5);
      // The same profile with the drift held at 0 reads the lamp as a longer delay (measured
      // 2.56 ± 0.77 and 2.49 ± 0.74 s): a slow start and a dimming lamp bend a level cut's curve alike.
      const held = profileOf(3, DRIFT_PER_S, seed, false);
      expect(held.delayS - 1.5).toBeGreaterThan(0.7);
      expect(Math.abs(held.delayS - 1.5)).toBeGreaterThan(2 * Math.abs(found.delayS - 1.5));
    }
  });

  it('finds none where the rate starts at its full value', () => {
    for (const seed of [3, 4]) {
      const none = profileOf(0, DRIFT_PER_S, seed, true);
      expect(none.kept).toBe(false);
      expect(none.delayS).toBeLessThan(3 * none.sigmaS);
    }
  });
});

describe('the gain drift a chip holds at the run\'s delay', () => {
  // γ linear in δ on the grid, 1 − 0.5·δ (×10⁻⁶/s), σ 0.2·10⁻⁶ at every δ.
  const profile: JointStartDelayProfile = {
    chi2: new Float64Array(START_DELAY_GRID_S.length), points: 100,
    driftPerS: Float64Array.from(START_DELAY_GRID_S, (d) => (1 - 0.5 * d) * 1e-6),
    driftSigmaPerS: Float64Array.from(START_DELAY_GRID_S, () => 0.2e-6),
  };

  it('reads γ between the grid points at δ̂ and widens its σ by γ\'s change over ±σ_δ', () => {
    const d = driftAtDelay(profile, 1.2, 0.4);
    expect(d.perS).toBeCloseTo(0.4e-6, 15);
    // ½|γ(1.6) − γ(0.8)| = 0.5·0.4 = 0.2 (×10⁻⁶), in quadrature with 0.2.
    expect(d.sigmaPerS).toBeCloseTo(Math.hypot(0.2e-6, 0.2e-6), 15);
    expect(driftAtDelay(profile, 1.2, 0).sigmaPerS).toBeCloseTo(0.2e-6, 15);
  });
});

describe('the delay of a run cut on level, pooled from its chips', () => {
  const grid = START_DELAY_GRID_S;
  const parabola = (centre: number, sigma: number) => ({ chi2: Float64Array.from(grid, (d) => ((d - centre) ** 2 - centre ** 2) / sigma ** 2), points: 1600 });

  it('keeps a delay past 1σ of 0 (χ² lower by more than 1), where Schwarz would not', () => {
    const p = pooledLevelDelay([parabola(1, 0.5)])!;
    expect(p.delayS).toBeCloseTo(1, 6);
    expect(p.gainChi2).toBeCloseTo(4, 6);
    expect(p.kept).toBe(true);
    expect(pooledStartDelay([parabola(1, 0.5)])!.kept).toBe(false);
    expect(pooledLevelDelay([parabola(0.4, 0.5)])!.kept).toBe(false);
  });

  it('keeps none inside the grid\'s first step, however large the gain, as the layers\' pool does', () => {
    // the white-noise BBAR of the chamber simulator (no ramp) read 0.26 and 0.38 s on two seeds
    const inside = pooledLevelDelay([parabola(0.35, 0.1)])!;
    expect(inside.delayS).toBeCloseTo(0.35, 6);
    expect(inside.gainChi2).toBeGreaterThan(10);
    expect(inside.kept).toBe(false);
    expect(pooledLevelDelay([parabola(0.6, 0.1)])!.kept).toBe(true);
  });

  it('keeps none where χ² rises from 0 though the parabola through its first points has its vertex past 0', () => {
    // The sample four-layer AR without a ramp, as its joint fit profiled it.
    const rising = { chi2: Float64Array.of(0, 7.3, 47.3, 118.3, 220.3, 355, 524.6), points: 1600 };
    // (the layers' pooling places no delay inside the grid's first step either: before, its
    // parabola's vertex put δ̂ at 0.14 s with χ² 1.25 lower)
    const plain = pooledStartDelay([rising])!;
    expect(plain.delayS).toBe(0);
    expect(plain.kept).toBe(false);
    expect(pooledLevelDelay([rising])!.kept).toBe(false);
  });
});
