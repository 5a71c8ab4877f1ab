import { describe, expect, it } from 'vitest';
import { calibrateChip } from '../calibrateChip';

// A chip change logged at 86 Hz (the bench's rate): the old chip's level, a dark dip of 0.5 s, then
// 20 s of the bare new chip, under a lock-in's noise: white 0.03 % plus AR(1) 0.06 % of full scale
// correlated over 1 s (an Ornstein–Uhlenbeck process sampled exactly: x ← ρx + σ√(1 − ρ²)·g,
// ρ = e^(−Δt/τ)). The generator is this test's own.
const DT = 1 / 86, TAU = 1, WHITE = 0.0003, AR = 0.0006, STRAY = 0.003, BARE = 0.93, M0 = 0.932;

function rng(seed: number) {
  let s = seed >>> 0;
  const u = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) + 0.5) / 2 ** 32;
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

function idleStretch(seed: number): Float64Array {
  const g = rng(seed);
  const rho = Math.exp(-DT / TAU);
  let x = AR * g();
  const out: number[] = [];
  const push = (level: number) => {
    x = rho * x + AR * Math.sqrt(1 - rho * rho) * g();
    out.push(level + STRAY + x + WHITE * g());
  };
  for (let i = 0; i < Math.round(3 / DT); i++) push(0.4); // the old chip
  for (let i = 0; i < Math.round(0.3 / DT); i++) push(0.4 * (1 - i / Math.round(0.3 / DT))); // the beam cut off
  for (let i = 0; i < Math.round(0.5 / DT); i++) push(0); // dark: the stray light alone
  for (let i = 0; i < Math.round(0.3 / DT); i++) push(BARE * (i / Math.round(0.3 / DT)));
  for (let i = 0; i < Math.round(20 / DT); i++) push(BARE);
  return Float64Array.from(out);
}

/**
 * σ of the mean of m samples of white + AR(1) noise (Box and Jenkins, the variance of a sample mean
 * of a stationary series; from memory): σ_w²/m + (σ_x²/m)·[1 + 2·Σ_{k<m} (1 − k/m)·ρ^k].
 */
function closedFormMeanSigma(m: number): number {
  const rho = Math.exp(-DT / TAU);
  let sum = 1;
  for (let k = 1; k < m; k++) sum += 2 * (1 - k / m) * rho ** k;
  return Math.sqrt((WHITE * WHITE) / m + ((AR * AR) / m) * sum);
}

describe('a dark dip read on a fast trace under a lock-in\'s correlated noise', () => {
  it('gives the dip\'s mean a σ near the closed form\'s, and the errors over 200 chip changes that σ', () => {
    const z: number[] = [];
    const ratios: number[] = [];
    for (let seed = 1; seed <= 200; seed++) {
      const c = calibrateChip({ chip: 2, idleSignal: idleStretch(seed), firstLayerSignal: [], modelledBare: M0, knownOffset: STRAY, previousChipLevel: 0.4 + STRAY, sampleS: DT });
      expect(c.offsetSource).toBe('dark');
      ratios.push(c.offsetSigma / closedFormMeanSigma(c.darkSamples));
      z.push((c.offset - STRAY) / c.offsetSigma);
    }
    ratios.sort((a, b) => a - b);
    // the σ of each dip's mean from the bare stretch's own noise, against the closed form at the noise as made
    expect(ratios[100]).toBeGreaterThan(0.75);
    expect(ratios[100]).toBeLessThan(1.35);
    // and honest: the RMS of the errors over their σ near 1 (read as AR(1) alone, trace/meanSigma, the σ came out a fifth of the closed form's and the RMS 4.9)
    const rmsZ = Math.sqrt(z.reduce((a, b) => a + b * b, 0) / z.length);
    expect(rmsZ).toBeGreaterThan(0.7);
    expect(rmsZ).toBeLessThan(1.3);
  });
});
