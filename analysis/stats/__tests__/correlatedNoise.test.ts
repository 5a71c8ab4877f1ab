import { describe, expect, it } from 'vitest';
import { addToVariogramPool, autocorrelationTime, effectiveSampleCount, fitAr1PlusWhite, newVariogramPool, whitenAr1PlusWhite } from '..';
import { invertSymmetric } from '../../fit/invertSymmetric';
import { createRng } from '../../synth';

/** White (σ_w) plus AR(1) (σ_x, lag-one correlation ρ), exact stationary start. */
function ar1PlusWhite(n: number, whiteSigma: number, arSigma: number, rho: number, seed: number): Float64Array {
  const rng = createRng(seed);
  const e = new Float64Array(n);
  let x = arSigma * rng.normal();
  for (let i = 0; i < n; i++) {
    if (i > 0) x = rho * x + arSigma * Math.sqrt(1 - rho * rho) * rng.normal();
    e[i] = x + whiteSigma * rng.normal();
  }
  return e;
}

describe('effective sample count under AR(1) noise', () => {
  it('gives τ → (1 + ρ)/(1 − ρ) (Bayley and Hammersley 1946; the AR(1) variance of the mean)', () => {
    // Var(mean) of AR(1) → σ²/n·(1 + ρ)/(1 − ρ) for large n (e.g. H. von Storch, F. W. Zwiers,
    // "Statistical Analysis in Climate Research", CUP (1999), §17.1.3; from memory).
    const rho = 0.8;
    const e = ar1PlusWhite(200_000, 0, 1, rho, 7);
    const tau = autocorrelationTime(e);
    // The sum truncated at the first ρ_k ≤ 0 carries some of the estimates' noisy tail: a few % high.
    expect(tau).toBeGreaterThan(9 * 0.95);
    expect(tau).toBeLessThan(9 * 1.15);
    expect(effectiveSampleCount(e)).toBeCloseTo(e.length / tau, 6);
  });
});

describe('white plus AR(1) noise from the variogram', () => {
  it('recovers the parts and the long-run σ of a lock-in-like noise (1 s at 10 Hz, 0.03 % white + 0.06 % AR)', () => {
    const rho = Math.exp(-0.1);
    const truth = Math.sqrt(0.0003 ** 2 + (0.0006 ** 2 * (1 + rho)) / (1 - rho));
    const e = ar1PlusWhite(30_000, 0.0003, 0.0006, rho, 3);
    const f = fitAr1PlusWhite(e);
    expect(f.rho).toBeGreaterThan(0.88);
    expect(f.rho).toBeLessThan(0.93);
    expect(Math.sqrt(f.whiteVar)).toBeGreaterThan(0.00025);
    expect(Math.sqrt(f.whiteVar)).toBeLessThan(0.00035);
    expect(f.longRunSigma / truth).toBeGreaterThan(0.85);
    expect(f.longRunSigma / truth).toBeLessThan(1.15);
  });

  it('finds white noise white', () => {
    const f = fitAr1PlusWhite(ar1PlusWhite(20_000, 0.001, 0, 0, 5));
    expect(f.longRunSigma / 0.001).toBeGreaterThan(0.95);
    expect(f.longRunSigma / 0.001).toBeLessThan(1.05);
  });

  it('is not moved much by a slow trend, unlike the series variance', () => {
    const e = ar1PlusWhite(10_000, 0.0003, 0.0006, Math.exp(-0.1), 9);
    const trended = e.map((v, i) => v + 0.002 * Math.sin((2 * Math.PI * i) / 5000));
    const a = fitAr1PlusWhite(e).longRunSigma, b = fitAr1PlusWhite(trended).longRunSigma;
    expect(Math.abs(b / a - 1)).toBeLessThan(0.1);
  });
});

describe('whitening white plus AR(1) noise (GLS by the innovations)', () => {
  it('is the Prais–Winsten transformation without white noise (Prais and Winsten 1954)', () => {
    // Prais–Winsten: y*_0 = √(1 − ρ²)·y_0, y*_t = y_t − ρ·y_{t−1}; over σ_u = σ_x·√(1 − ρ²).
    const rho = 0.6, sx = 2;
    const y = Float64Array.of(1.5, -0.3, 2.2, 0.7, -1.1, 0.4);
    const w = Float64Array.from(y);
    whitenAr1PlusWhite({ whiteVar: 0, ar1Var: sx * sx, rho }, [w]);
    const su = sx * Math.sqrt(1 - rho * rho);
    expect(w[0]).toBeCloseTo((Math.sqrt(1 - rho * rho) * y[0]) / su, 12);
    for (let t = 1; t < y.length; t++) expect(w[t]).toBeCloseTo((y[t] - rho * y[t - 1]) / su, 12);
  });

  it('gives WᵀW = Σ⁻¹ for Σ = σ_w²·I + σ_x²·ρ^|i−j| (the defining property of GLS whitening)', () => {
    const n = 7, R = 0.3, X = 1.7, rho = 0.75;
    const sigma = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) sigma[i * n + j] = X * rho ** Math.abs(i - j) + (i === j ? R : 0);
    // W's columns: the filter applied to the unit vectors.
    const cols = Array.from({ length: n }, (_, j) => Float64Array.from({ length: n }, (_, i) => (i === j ? 1 : 0)));
    whitenAr1PlusWhite({ whiteVar: R, ar1Var: X, rho }, cols);
    const inv = invertSymmetric(sigma, n)!;
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += cols[a][i] * cols[b][i];
        expect(s).toBeCloseTo(inv[a * n + b], 10);
      }
    }
  });
});

/** The robust variogram's sum at lag k by its definition, sorting for the medians: ½·Σ min(|d − med d|, 4·1.4826·MAD)². */
function directHalfSum(e: Float64Array, k: number): number {
  const d = Array.from({ length: e.length - k }, (_, i) => e[i + k] - e[i]);
  const mid = (v: number[]) => {
    const s = [...v].sort((a, b) => a - b), m = s.length >> 1;
    return s.length % 2 === 1 ? s[m] : 0.5 * (s[m - 1] + s[m]);
  };
  const med = mid(d);
  const cap = 4 * 1.4826 * mid(d.map((x) => Math.abs(x - med)));
  let ss = 0;
  for (const x of d) ss += Math.min(Math.abs(x - med), cap) ** 2;
  return ss / 2;
}

describe('the robust variogram (its pooled sums)', () => {
  it('equals the direct sum with sorted medians at every lag: spikes, a trend, steps, ties, short and long series', () => {
    const spiky = ar1PlusWhite(6001, 1, 0.8, 0.95, 21);
    for (let i = 0; i < spiky.length; i += 131) spiky[i] += 40;
    // a steep trend moves the differences' median with the lag; a strong AR(1) alone moves the MAD
    const trended = ar1PlusWhite(5000, 0.2, 0, 0, 22).map((v, i) => v + 0.01 * i);
    const steep = ar1PlusWhite(4000, 0.05, 1, 0.5, 23);
    // readings in steps of a quantiser (many ties, medians of exactly 0), and a few steps in level
    const ties = ar1PlusWhite(3000, 1, 0.5, 0.9, 24).map((v, i) => Math.round(v * 2) + (i > 1500 ? 3 : 0));
    const short = ar1PlusWhite(900, 1, 0.8, 0.9, 25);
    // a sawtooth of period 37 with a little noise: the differences' median jumps from +18 to −18 between lags
    const saw = ar1PlusWhite(4000, 0.01, 0, 0, 26).map((v, i) => v + (i % 37));
    for (const e of [spiky, trended, steep, ties, short, saw]) {
      const pool = newVariogramPool();
      const lags = addToVariogramPool(e, 60, pool);
      expect(lags.slice(0, 9)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 10]);
      for (const k of lags) {
        expect(pool.counts.get(k)).toBe(e.length - k);
        expect(pool.sums.get(k)! / directHalfSum(e, k) - 1).toBeCloseTo(0, 12);
      }
    }
  });

  it('reads σ² at every lag from white noise and σ_w² + σ_x²·(1 − ρ^k) from white + AR(1) noise', () => {
    // γ(k) = ½·E(e_{i+k} − e_i)² = Var e − Cov(e_i, e_{i+k}); the AR(1) autocorrelation is ρ^k
    // (G. E. P. Box, G. M. Jenkins, "Time Series Analysis", Holden-Day (1970), §3.2; from memory).
    // Winsorising at 4 σ trims E d² by about 0.3 % for Gaussian d (common practice: 4σ tails).
    const n = 40_000;
    const white = newVariogramPool();
    for (const k of addToVariogramPool(ar1PlusWhite(n, 0.5, 0, 0, 31), 40, white)) {
      expect(white.sums.get(k)! / white.counts.get(k)! / 0.25 - 1).toBeLessThan(0.03);
      expect(white.sums.get(k)! / white.counts.get(k)! / 0.25 - 1).toBeGreaterThan(-0.03);
    }
    const rho = 0.9, sw = 0.3, sx = 0.6;
    const mixed = newVariogramPool();
    for (const k of addToVariogramPool(ar1PlusWhite(n, sw, sx, rho, 32), 40, mixed)) {
      const want = sw * sw + sx * sx * (1 - rho ** k);
      // the AR(1) part's variance is read from n/τ ≈ 2000 independent stretches: some 5 %
      expect(Math.abs(mixed.sums.get(k)! / mixed.counts.get(k)! / want - 1)).toBeLessThan(0.08);
    }
  });
});
