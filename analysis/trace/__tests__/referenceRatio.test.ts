import { describe, expect, it } from 'vitest';
import { REFERENCE_WINDOWS_S, referenceRatio, referenceWindowS, runningMean } from '../referenceRatio';

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

// The window the reference is smoothed over (Mallows' C_L among REFERENCE_WINDOWS_S). Checked
// against the closed-form risk of a boxcar: a sinusoid of frequency f through a centred running
// mean of width w keeps sin(πfw)/(πfw) of its amplitude (the boxcar's transfer function; e.g.
// A. V. Oppenheim & R. W. Schafer, "Discrete-Time Signal Processing", the moving average's
// frequency response, here in its continuous limit; from memory), so the lamp's error after smoothing has mean
// square (a·(1 − sinc))²/2 from the ripple plus σ²/nᵢ from the reference's own noise.
describe('referenceWindowS', () => {
  const n = 12000, dt = 0.1;
  const t = Float64Array.from({ length: n }, (_, i) => i * dt);
  let state = 777;
  const uniform = () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 4294967296);
  const gauss = () => (uniform() + uniform() + uniform() + uniform() - 2) * Math.sqrt(3);
  const sigma = 0.0003;
  const drift = (s: number) => 1 - (0.01 * s) / 3600;

  it('keeps the longest window for a lamp that only drifts', () => {
    const reference = Float64Array.from(t, (s) => 0.8 * drift(s) * (1 + sigma * gauss()));
    expect(referenceWindowS(t, reference).windowS).toBe(20);
  });

  it('follows a mains ripple aliased into a 20 s beat: the window of least closed-form risk, and the lamp read far better than over 20 s', () => {
    // a 0.2 % ripple at 100.05 Hz read every 0.1 s: sin(2π·100.05·t) = sin(2π·0.05·t) at t = k·0.1
    const a = 0.002, beatHz = 0.05;
    const lamp = (s: number) => drift(s) * (1 + a * Math.sin(2 * Math.PI * 100.05 * s));
    const reference = Float64Array.from(t, (s) => 0.8 * lamp(s) * (1 + sigma * gauss()));
    const sinc = (x: number) => (x === 0 ? 1 : Math.sin(x) / x);
    const risk = REFERENCE_WINDOWS_S.map((w) => ((a * (1 - sinc(Math.PI * beatHz * w))) ** 2) / 2 + sigma ** 2 / (2 * Math.round(w / dt / 2) + 1));
    const best = REFERENCE_WINDOWS_S[risk.indexOf(Math.min(...risk))];
    expect(best).toBe(2);
    const { windowS } = referenceWindowS(t, reference);
    expect(windowS).toBe(best);
    // the lamp as the ratio divides it out, against the truth, away from the ends
    const error = (w: number) => {
      const m = runningMean(t, reference, w);
      let ss = 0, count = 0;
      for (let i = 300; i < n - 300; i++) {
        ss += (m[i] / (0.8 * lamp(t[i])) - 1) ** 2;
        count++;
      }
      return Math.sqrt(ss / count);
    };
    // closed form: 2 s, √(risk) ≈ 7e-5; 20 s, the beat left whole: a/√2 ≈ 1.4e-3
    expect(error(windowS)).toBeLessThan(1.5 * Math.sqrt(risk[REFERENCE_WINDOWS_S.indexOf(2)]));
    expect(error(20)).toBeGreaterThan(0.8 * (a / Math.SQRT2));
  });
});

