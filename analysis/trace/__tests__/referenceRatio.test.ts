import { describe, expect, it } from 'vitest';
import { referenceRatio, runningMean } from '../referenceRatio';

// A dual-beam monitor's ratio: signal = G·L(t)·T(t), reference = g·L(t). Dividing by the
// reference over its median leaves G·L_med·T(t): the film's curve with the lamp held still.
describe('referenceRatio', () => {
  const n = 6000, dt = 0.1;
  const t = Float64Array.from({ length: n }, (_, i) => i * dt);
  const lamp = (s: number) => 1 - (0.01 * s) / 3600; // −1 %/h
  const film = (s: number) => 0.92 - 0.3 * Math.sin(s / 40) ** 2;

  it('a running mean of a straight line is the line, away from the ends (a centred window)', () => {
    const y = Float64Array.from(t, (s) => 3 + 0.5 * s);
    const m = runningMean(t, y, 20);
    for (let i = 200; i < n - 200; i += 97) expect(m[i]).toBeCloseTo(y[i], 9);
    // at the ends the window is cut: its mean is the mean of the samples it holds
    expect(m[0]).toBeCloseTo(3 + 0.5 * 5, 9);
  });

  it('removes a lamp drift the signal and reference share, and keeps the scale of the median lamp', () => {
    const signal = Float64Array.from(t, (s) => 1.3 * lamp(s) * film(s));
    const reference = Float64Array.from(t, (s) => 0.8 * lamp(s));
    const r = referenceRatio(t, signal, reference, 20).signal;
    const lampMid = lamp((t[n / 2 - 1] + t[n / 2]) / 2); // the median of an even count: the middle two's mean
    let inside = 0, ends = 0;
    for (let i = 0; i < n; i++) {
      const e = Math.abs(r[i] / (1.3 * lampMid * film(t[i])) - 1);
      if (i >= 100 && i < n - 100) inside = Math.max(inside, e);
      else ends = Math.max(ends, e);
    }
    expect(inside).toBeLessThan(1e-9);
    // within half a window of the ends the mean is one-sided: up to 5 s × 1 %/h = 1.4e-5
    expect(ends).toBeLessThan(1.5e-5);
    // without the division the drift over the 10 minutes is 0.17 %
    expect(Math.abs(signal[n - 1] / (1.3 * lampMid * film(t[n - 1])) - 1)).toBeGreaterThan(5e-4);
  });

  it("averages the reference's own white noise down by about the window's sample count", () => {
    // a fixed pseudo-random sequence (a linear congruential generator, Numerical Recipes' constants)
    let state = 12345;
    const uniform = () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 4294967296);
    const noise = () => (uniform() + uniform() + uniform() + uniform() - 2) * Math.sqrt(3); // σ 1
    const signal = new Float64Array(n).fill(1);
    const reference = Float64Array.from(t, () => 1 + 0.001 * noise());
    const r = referenceRatio(t, signal, reference, 20).signal;
    let ss = 0;
    for (let i = 100; i < n - 100; i++) ss += (r[i] - 1) ** 2;
    const sigma = Math.sqrt(ss / (n - 200));
    // 201 samples in 20 s: 0.001/√201 ≈ 7.1e-5
    expect(sigma).toBeGreaterThan(4e-5);
    expect(sigma).toBeLessThan(1.1e-4);
  });
});
