import { describe, expect, it } from 'vitest';
import { spectrumLines } from '../fringeSpectrum';

// Lines in a series with no carrier (a run's residuals): checked against what was put in, and
// against the false-alarm rate of a Rayleigh-distributed noise amplitude (P(A > k·median) = 2^(−k²);
// J. D. Scargle, ApJ 263, 835 (1982), in amplitude; from memory).
const dt = 0.1, n = 16000;
const t = Float64Array.from({ length: n }, (_, i) => i * dt);

/** A fixed pseudo-random sequence (a linear congruential generator, Numerical Recipes' constants), near-Gaussian. */
function gaussian(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 4294967296);
  return () => (uniform() + uniform() + uniform() + uniform() - 2) * Math.sqrt(3);
}

/** White noise σw plus AR(1) noise σa with correlation time τ (x ← ρx + √(1−ρ²)σa·g): a lock-in's red spectrum. */
function noise(seed: number, sw: number, sa: number, tauS: number): Float64Array {
  const g = gaussian(seed), rho = Math.exp(-dt / tauS);
  let x = 0;
  return Float64Array.from(t, () => (x = rho * x + Math.sqrt(1 - rho * rho) * sa * g()) + sw * g());
}

describe('spectrumLines', () => {
  it('finds a line under red noise at its frequency and amplitude, and names the mains harmonics that fall there at 10 Hz (each is a multiple of 10 Hz, ±0.2 % of it: 0.1–0.3 Hz about 0)', () => {
    const y = noise(3, 3e-4, 6e-4, 1);
    // 100.05 Hz read every 0.1 s: 0.05 Hz
    for (let i = 0; i < n; i++) y[i] += 1e-3 * Math.sin(2 * Math.PI * 100.05 * t[i]);
    const lines = spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10 });
    expect(lines.length).toBe(1);
    expect(lines[0].frequencyHz).toBeCloseTo(0.05, 3);
    expect(lines[0].amplitude / 1e-3).toBeGreaterThan(0.9);
    expect(lines[0].amplitude / 1e-3).toBeLessThan(1.1);
    expect(lines[0].note).toMatch(/^where 50, 100 or 150 Hz \(the 50 Hz mains and its harmonics, within ±0.2 %\) fall when sampled at 10 Hz/);
  });

  it('a line no mains harmonic reaches is put to the holder or a vibration', () => {
    const y = noise(4, 3e-4, 0, 1);
    for (let i = 0; i < n; i++) y[i] += 5e-4 * Math.sin(2 * Math.PI * 1.37 * t[i]);
    const lines = spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10 });
    expect(lines.map((l) => +l.frequencyHz.toFixed(2))).toEqual([1.37]);
    expect(lines[0].note).toMatch(/^e\.g\. the holder's rotation/);
  });

  it('keeps one line of a ripple on a varying level, not its sidebands', () => {
    const y = noise(5, 3e-4, 0, 1);
    // the ripple scaled by a level that swings with a 400 s period: sidebands 0.0025 Hz either side
    for (let i = 0; i < n; i++) y[i] += 1e-3 * (0.6 + 0.4 * Math.sin((2 * Math.PI * t[i]) / 400)) * Math.sin(2 * Math.PI * 0.05 * t[i]);
    const lines = spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10 });
    expect(lines.length).toBe(1);
    expect(lines[0].frequencyHz).toBeCloseTo(0.05, 3);
  });

  it('a line under the least amplitude asked for is not reported', () => {
    const y = noise(6, 3e-5, 0, 1);
    for (let i = 0; i < n; i++) y[i] += 1e-4 * Math.sin(2 * Math.PI * 0.4 * t[i]);
    expect(spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10 }).map((l) => +l.frequencyHz.toFixed(2))).toEqual([0.4]);
    expect(spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10, minAmplitude: 3e-4 })).toEqual([]);
  });

  it('noise alone, white or red: false lines at about the rate the default threshold is set for', () => {
    // 60 series at a false-alarm rate of 0.001 each: more than two would be out of line (P < 2e-5 by Poisson)
    let found = 0;
    for (let seed = 100; seed < 160; seed++) {
      const y = seed % 2 ? noise(seed, 3e-4, 0, 1) : noise(seed, 3e-4, 6e-4, 1);
      found += spectrumLines(t, y, { minFrequencyHz: 0.01, rawRateHz: 10 }).length;
    }
    expect(found).toBeLessThanOrEqual(2);
  });
});
