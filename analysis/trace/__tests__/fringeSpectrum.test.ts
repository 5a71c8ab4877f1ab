import { describe, expect, it } from 'vitest';
import { fringeSpectrum } from '../fringeSpectrum';
import { gaussian } from './rng';

function series(durationS: number, rateHz: number, f: (t: number) => number, noise = 0, seed = 1) {
  const n = Math.round(durationS * rateHz);
  const g = gaussian(seed);
  const t = Float64Array.from({ length: n }, (_, i) => i / rateHz);
  return { t, y: Float64Array.from(t, (v) => f(v) + noise * g()) };
}
const TAU = 2 * Math.PI;

describe('fringeSpectrum', () => {
  it('finds the fringe frequency and amplitude of a sinusoid on a drifting baseline', () => {
    for (const f0 of [0.0213, 0.047, 0.11]) {
      const { t, y } = series(600, 10, (v) => 0.6 + 1e-4 * v + 0.2 * Math.sin(TAU * f0 * v + 0.4), 0.0006);
      const s = fringeSpectrum(t, y);
      expect(Math.abs(s.dominantFrequencyHz / f0 - 1)).toBeLessThan(0.005);
      expect(s.dominantPeriodS).toBeCloseTo(1 / s.dominantFrequencyHz, 12);
      expect(Math.abs(s.peaks[0].amplitude / 0.2 - 1)).toBeLessThan(0.03);
      expect(s.peaks[0].relative).toBe(1);
      expect(s.disturbances).toEqual([]);
      expect(s.resampled).toBe(false);
    }
  });

  it('reports a substrate-rotation ripple well above the fringe frequency', () => {
    const { t, y } = series(900, 10, (v) => 0.6 + 0.2 * Math.cos(TAU * 0.02 * v) + 0.002 * Math.sin(TAU * 0.5 * v), 0.0005, 3);
    const s = fringeSpectrum(t, y);
    expect(s.dominantFrequencyHz).toBeCloseTo(0.02, 3);
    expect(s.disturbances).toHaveLength(1);
    const [d] = s.disturbances;
    expect(Math.abs(d.frequencyHz - 0.5)).toBeLessThan(0.002);
    expect(Math.abs(d.amplitude / 0.002 - 1)).toBeLessThan(0.15);
    expect(d.note).toMatch(/^periodic disturbance at 0\.5000 Hz \(period 2\.000 s\), 0\.9\d % of the fringe amplitude: e\.g\. substrate rotation/);
  });

  it('does not take the bumps of correlated (red) noise for periodic disturbances', () => {
    // A quarter of a fringe over 240 s at 50 Hz with AR(1) noise of 0.06 % and 1 s correlation
    // (exact discretisation of Ornstein–Uhlenbeck: φ = e^(−Δt/τ), innovation σ·√(1 − φ²);
    // Gillespie 1996, Am. J. Phys. 64, 225, from memory) plus 0.03 % white: such noise has
    // a Lorentzian spectrum, far above the band's median below 1/(2πτ) ≈ 0.16 Hz, and its
    // random bumps there are not periodic.
    for (const [seed, periodS] of [[1, 960], [2, 960], [3, 960], [4, 100], [5, 100], [6, 100]]) {
      const g = gaussian(seed), rateHz = 50, dt = 1 / rateHz, phi = Math.exp(-dt / 1);
      let ar = 0;
      const { t, y } = series(240, rateHz, (v) => {
        ar = phi * ar + 0.0006 * Math.sqrt(1 - phi * phi) * g();
        return 0.5 + 0.2 * Math.sin((TAU * v) / periodS) + ar;
      }, 0.0003, seed + 100);
      const s = fringeSpectrum(t, y, { maxFftSize: 4096, padFactor: 1 });
      expect(s.disturbances.map((d) => d.note)).toEqual([]);
    }
  });

  it('still finds a rotation ripple standing above correlated noise', () => {
    // 2.4 fringes in 240 s, a 0.3 Hz ripple of 0.2 % of full scale in the same red noise
    const g = gaussian(9), rateHz = 50, dt = 1 / rateHz, phi = Math.exp(-dt / 1);
    let ar = 0;
    const { t, y } = series(240, rateHz, (v) => {
      ar = phi * ar + 0.0006 * Math.sqrt(1 - phi * phi) * g();
      return 0.5 + 0.2 * Math.sin((TAU * v) / 100) + 0.002 * Math.sin(TAU * 0.3 * v) + ar;
    }, 0.0003, 109);
    const s = fringeSpectrum(t, y, { maxFftSize: 4096, padFactor: 1 });
    expect(s.disturbances).toHaveLength(1);
    expect(Math.abs(s.disturbances[0].frequencyHz - 0.3)).toBeLessThan(0.01);
  });

  it('recognises 50 Hz mains aliased by slow sampling', () => {
    // sampled at 7 Hz, 50 Hz folds to |50 − 7·7| = 1 Hz
    const { t, y } = series(600, 7, (v) => 0.5 + 0.15 * Math.sin(TAU * 0.03 * v) + 0.003 * Math.sin(TAU * 50 * v), 0.0005, 4);
    const s = fringeSpectrum(t, y);
    expect(s.disturbances).toHaveLength(1);
    expect(s.disturbances[0].frequencyHz).toBeCloseTo(1, 2);
    expect(s.disturbances[0].note).toContain('matches 50 Hz mains aliased by sampling at 7 Hz');
  });

  it('does not report the harmonics of a non-sinusoidal fringe as disturbances', () => {
    const w = TAU * 0.025;
    const { t, y } = series(800, 10, (v) => 0.5 + 0.2 * Math.cos(w * v) + 0.05 * Math.cos(2 * w * v) + 0.02 * Math.cos(3 * w * v) + 0.01 * Math.cos(4 * w * v), 0.0005, 5);
    const s = fringeSpectrum(t, y);
    expect(s.dominantFrequencyHz).toBeCloseTo(0.025, 3);
    expect(s.peaks.map((p) => Math.round(p.frequencyHz / 0.025))).toEqual([1, 2, 3, 4].slice(0, s.peaks.length));
    expect(s.peaks.length).toBeGreaterThanOrEqual(3);
    expect(s.disturbances).toEqual([]);
  });

  it('resamples jittered time stamps onto a uniform grid', () => {
    const g = gaussian(11);
    const n = 5000;
    const t = Float64Array.from({ length: n }, (_, i) => i * 0.1 + 0.03 * Math.max(-1, Math.min(1, g())) * (i > 0 && i < n - 1 ? 1 : 0));
    const y = Float64Array.from(t, (v) => 0.4 + 0.1 * Math.sin(TAU * 0.037 * v));
    const s = fringeSpectrum(t, y);
    expect(s.resampled).toBe(true);
    expect(Math.abs(s.dominantFrequencyHz / 0.037 - 1)).toBeLessThan(0.005);
  });

  it('averages long series into maxFftSize and says so', () => {
    const { t, y } = series(2000, 50, (v) => 0.5 + 0.2 * Math.sin(TAU * 0.05 * v), 0.001, 6);
    const s = fringeSpectrum(t, y, { maxFftSize: 4096 });
    expect(s.fftSize).toBe(4096);
    expect(s.blockSize).toBe(Math.ceil((100_000 * 2) / 4096));
    expect(s.nyquistHz).toBeCloseTo(25 / s.blockSize, 12);
    expect(Math.abs(s.dominantFrequencyHz / 0.05 - 1)).toBeLessThan(0.005);
  });

  it('gives NaN for a straight line and rejects short or bad input with exact messages', () => {
    const t = Float64Array.from({ length: 100 }, (_, i) => i);
    expect(fringeSpectrum(t, Float64Array.from(t, (v) => 0.2 + 0.01 * v)).dominantFrequencyHz).toBeNaN();
    expect(() => fringeSpectrum([0, 1, 2], [1, 2, 3])).toThrow(new RangeError('fringeSpectrum: needs at least 8 samples, got 3'));
    expect(() => fringeSpectrum(t, Float64Array.from(t, (v) => (v === 50 ? NaN : v)))).toThrow(new RangeError('fringeSpectrum: sample 50 is not finite'));
    expect(() => fringeSpectrum(t, t, { maxFftSize: 1000 })).toThrow(new RangeError('fringeSpectrum: maxFftSize must be a power of two ≥ 16, got 1000'));
  });
});
