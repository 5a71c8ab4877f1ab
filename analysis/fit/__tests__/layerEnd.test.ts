import { describe, expect, it } from 'vitest';
import { stackRT } from '@/tests/chamber/thinFilm';
import { gaussian } from '../../trace/__tests__/rng';
import { growthPosterior } from '../growthPosterior';
import { levelEvidence, meanSigma, settledLevelAfter, startCheck, startLevel } from '../layerEnd';

// One TiO2-like layer (n = 2.3, k = 0) on glass (1.52, back face incoherent), transmittance at
// 600 nm, built with the chamber simulator's own matrices (tests/chamber/thinFilm.ts), not ours.
const media = { ambient: 1, substrate: 1.52, backside: true };
const T = (d: number) => stackRT([{ n: 2.3, k: 0, thicknessNm: d }], 600, media).T;
const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: true, wavelengthNm: 600, mode: 'T' as const };

/** Layer at `rate` for `layerS`, then the shutter closing over `closeS` (rate falling linearly to 0), then idle. */
function trace(rate: number, layerS: number, closeS: number, idleS: number, sigma: number, seed: number) {
  const dt = 0.1, g = gaussian(seed);
  const time: number[] = [], signal: number[] = [];
  const total = layerS + idleS;
  for (let t = 0; t <= total + 1e-9; t += dt) {
    const after = t - layerS;
    const d = after <= 0 ? rate * t : rate * layerS + (after < closeS ? rate * (after - (after * after) / (2 * closeS)) : (rate * closeS) / 2);
    time.push(t);
    signal.push(T(d) + sigma * g());
  }
  return { timeS: Float64Array.from(time), signal: Float64Array.from(signal), lastIndex: Math.round(layerS / dt) };
}

/** The growth after the cut from the settled level alone, as the analysis reads it. */
function fromLevel(tr: ReturnType<typeof trace>, rate: number, layerS: number) {
  const settled = settledLevelAfter(tr.signal, tr.lastIndex + 1, tr.signal.length)!;
  const k = tr.lastIndex + 1 - 30;
  const ev = levelEvidence({
    settled, optics, below: [], index: 2.3, extinction: 0, rateNmPerS: rate, rateDriftNmPerS2: 0, durationS: layerS, gain: 1, offset: 0,
    lastReadings: tr.signal.subarray(k, tr.lastIndex + 1), lastTauS: tr.timeS.subarray(k, tr.lastIndex + 1),
  });
  return growthPosterior({ maxNm: rate * 2, level: { predict: ev.predict, observed: settled.level, sigma: ev.sigma, sigmaPerNm: ev.sigmaPerNm } });
}

describe('the end of a layer', () => {
  it('reads the growth while the shutter closes from the settled idle level (a cut on a slope)', () => {
    // 48 nm at 0.5 nm/s (about 0.73 QWOT: the signal still falls steeply), shutter 1 s: 0.25 nm more.
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      const g = fromLevel(trace(0.5, 96, 1, 20, 0.0005, seed), 0.5, 96);
      expect(Math.abs(g.deltaNm - 0.25)).toBeLessThan(3 * g.sigmaNm);
      expect(g.sigmaNm).toBeLessThan(0.08);
    }
  });

  it('after a cut at a turning point the level hardly tells the growth (second order)', () => {
    // A quarter-wave at 600 nm is 65.2 nm: the transmittance is at its extremum there (n·d = λ/4;
    // H. A. Macleod, Thin-Film Optical Filters, ch. 2; from memory). The same 0.25 nm after it
    // changes the reading by far less than the noise: the posterior stays wide.
    const g = fromLevel(trace(0.5, 130.43, 1, 20, 0.0005, 7), 0.5, 130.43);
    expect(g.sigmaNm).toBeGreaterThan(0.2);
  });

  it('reads the settled level after the closing ramp, and none from a stretch too short', () => {
    const y = Float64Array.from([...Array.from({ length: 8 }, (_, i) => 0.5 - 0.01 * i), ...Array.from({ length: 40 }, () => 0.42)]);
    const s = settledLevelAfter(y, 0, y.length)!;
    expect(s.level).toBeCloseTo(0.42, 6);
    expect(s.startIndex).toBeGreaterThanOrEqual(7);
    expect(settledLevelAfter(y, 0, 6)).toBeNull();
  });

  it('the σ of a mean of AR(1) noise follows σ·√((1 + ρ)/(1 − ρ)/n)', () => {
    // Box and Jenkins, Time Series Analysis, the AR(1) process (from memory): the variance of the
    // mean of n samples is σ²/n·(1 + ρ)/(1 − ρ) for n ≫ 1/(1 − ρ).
    const rho = 0.8, n = 400, reps = 400, g = gaussian(11);
    const means: number[] = [];
    let reported = 0;
    for (let r = 0; r < reps; r++) {
      const y = new Float64Array(n);
      let x = g();
      for (let i = 0; i < n; i++) {
        x = rho * x + Math.sqrt(1 - rho * rho) * g();
        y[i] = x;
      }
      const m = meanSigma(y);
      means.push(m.mean);
      reported += m.sigma / reps;
    }
    const expected = Math.sqrt(((1 + rho) / (1 - rho)) / n);
    const observed = Math.sqrt(means.reduce((a, m) => a + m * m, 0) / reps);
    expect(observed / expected).toBeGreaterThan(0.85);
    expect(observed / expected).toBeLessThan(1.15);
    expect(reported / expected).toBeGreaterThan(0.85);
    expect(reported / expected).toBeLessThan(1.1);
  });

  it("reads a layer's start level from a line through its first readings", () => {
    const tau = Float64Array.from({ length: 20 }, (_, i) => 0.1 * i);
    const y = Float64Array.from(tau, (t) => 0.62 - 0.004 * t);
    const s = startLevel(tau, y)!;
    expect(s.level).toBeCloseTo(0.62, 12);
    expect(s.sigma).toBeLessThan(1e-12);
    expect(startLevel(tau.subarray(0, 4), y.subarray(0, 4))).toBeNull();
  });

  it('names the layer that does not start where the one below ended, and only that one', () => {
    const settled = { level: 0.62, sigma: 0.0001, startIndex: 0, samples: 50 };
    const g = gaussian(3);
    const tau = Float64Array.from({ length: 20 }, (_, i) => 0.1 * i);
    const on = startLevel(tau, Float64Array.from(tau, (t) => 0.62 - 0.002 * t + 0.0005 * g()))!;
    expect(startCheck(5, 4, settled, on)).toBeNull();
    const off = startLevel(tau, Float64Array.from(tau, (t) => 0.64 - 0.002 * t + 0.0005 * g()))!;
    expect(startCheck(5, 4, settled, off)).toMatch(/^layer 5 starts at a reading of 0\.6[34]\d\d, but the reading settled at 0\.6200 after layer 4 \(a step of [12]\.\d\d % of full scale, \d+σ\): the layer does not start where the one below ended/);
  });
});
