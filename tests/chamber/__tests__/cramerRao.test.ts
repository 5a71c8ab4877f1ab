import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { Detector } from '../detector';
import { chamberRng } from '../rng';
import { fisherInformation, invert, maxAbsNormal, whiten, type Ar1WhiteNoise } from '../harness/cramerRao';
import { jacobianColumns, layerBound, layerSignalModel } from '../harness/layerBound';
import { scenarios } from '../scenarios';
import { simulateChamberRun } from '../simulateChamberRun';
import { wanderBoundNm } from '../harness/wanderBound';
import { chipBound } from '../harness/chipBound';

// The Cramér–Rao bound code of the test tree (harness/cramerRao.ts, harness/layerBound.ts)
// against closed forms and against an estimator that reaches it.
const ones = (n: number) => new Float64Array(n).fill(1);

describe('Cramér–Rao bound in white + AR(1) noise', () => {
  it('the mean of a constant in AR(1) noise: exact and asymptotic variance', () => {
    // AR(1) of stationary variance σ²: Σ⁻¹ is tridiagonal, diag (1, 1+ρ², …, 1+ρ², 1)/σ_e²,
    // off-diagonal −ρ/σ_e², σ_e² = σ²(1−ρ²) (Box, Jenkins & Reinsel, Time Series Analysis; from
    // memory), so 1ᵀΣ⁻¹1 = [(n−2)(1−ρ)² + 2(1−ρ)]/σ_e² and the mean's bound is
    // σ²(1+ρ)/((n−2)(1−ρ) + 2) → σ²(1+ρ)/(n(1−ρ)) for large n.
    const sigma = 0.0006, rho = Math.exp(-0.1);
    for (const n of [2, 10, 500]) {
      const f = fisherInformation([ones(n)], { whiteSigma: 0, ar1Sigma: sigma, rho })[0][0];
      const exact = (sigma * sigma * (1 + rho)) / ((n - 2) * (1 - rho) + 2);
      expect(1 / f / exact - 1).toBeCloseTo(0, 10);
    }
    const n = 40000;
    const f = fisherInformation([ones(n)], { whiteSigma: 0, ar1Sigma: sigma, rho })[0][0];
    expect(((1 / f) * n * (1 - rho)) / (sigma * sigma * (1 + rho))).toBeCloseTo(1, 3);
  });

  it('a straight line in white noise: Kay 1993, Example 3.4 (eq. 3.22)', () => {
    // x[n] = A + B·n + w[n], n = 0..N−1: var(Â) ≥ 2(2N−1)σ²/(N(N+1)), var(B̂) ≥ 12σ²/(N(N²−1))
    // (S. M. Kay, Fundamentals of Statistical Signal Processing: Estimation Theory, 1993; from memory)
    const N = 300, sigma = 0.001;
    const crb = invert(fisherInformation([ones(N), Float64Array.from({ length: N }, (_, i) => i)], { whiteSigma: sigma, ar1Sigma: 0, rho: 0 }));
    expect(crb[0][0] / ((2 * (2 * N - 1) * sigma * sigma) / (N * (N + 1)))).toBeCloseTo(1, 10);
    expect(crb[1][1] / ((12 * sigma * sigma) / (N * (N * N - 1)))).toBeCloseTo(1, 10);
  });

  it('white + AR(1): the innovations equal a dense Cholesky solve, and the mean reaches 2π·f(0)/n', () => {
    const noise: Ar1WhiteNoise = { whiteSigma: 0.0003, ar1Sigma: 0.0006, rho: 0.9 };
    const n = 150;
    // dense Σ and its Cholesky factor, written out here (Golub & Van Loan, Alg. 4.2.1; from memory)
    const S = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => noise.ar1Sigma ** 2 * noise.rho ** Math.abs(i - j) + (i === j ? noise.whiteSigma ** 2 : 0)));
    const L = S.map(() => new Array<number>(n).fill(0));
    for (let j = 0; j < n; j++) {
      let d = S[j][j];
      for (let k = 0; k < j; k++) d -= L[j][k] ** 2;
      L[j][j] = Math.sqrt(d);
      for (let i = j + 1; i < n; i++) {
        let s = S[i][j];
        for (let k = 0; k < j; k++) s -= L[i][k] * L[j][k];
        L[i][j] = s / L[j][j];
      }
    }
    const x = Float64Array.from({ length: n }, (_, i) => 1 + Math.sin(i / 7) + 0.01 * i);
    const z = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let s = x[i];
      for (let k = 0; k < i; k++) s -= L[i][k] * z[k];
      z[i] = s / L[i][i];
    }
    const w = whiten([x], noise)[0];
    for (let i = 0; i < n; i++) expect(Math.abs(w[i] - z[i])).toBeLessThan(1e-9 * Math.abs(z[0]));
    // asymptotically the mean's variance is the spectral density at 0: σ_w² + σ_x²(1+ρ)/(1−ρ), over n
    // (U. Grenander, M. Rosenblatt, Statistical Analysis of Stationary Time Series, 1957; from memory)
    const big = 60000;
    const f = fisherInformation([ones(big)], noise)[0][0];
    const spectral = noise.whiteSigma ** 2 + (noise.ar1Sigma ** 2 * (1 + noise.rho)) / (1 - noise.rho);
    expect((big / f) / spectral).toBeCloseTo(1, 2);
  });

  it('the largest |error| of independent normals: one N(0, 1), and many against draws', () => {
    const one = maxAbsNormal([1]);
    expect(one.mean).toBeCloseTo(Math.sqrt(2 / Math.PI), 4); // E|Z| = √(2/π)
    expect(one.quantile(0.95)).toBeCloseTo(1.959964, 4); // the two-sided 95 % point of the normal table
    const sigmas = Array.from({ length: 36 }, (_, i) => 0.2 + 0.01 * i);
    const m = maxAbsNormal(sigmas);
    const rng = chamberRng(5);
    const draws = Array.from({ length: 4000 }, () => Math.max(...sigmas.map((s) => Math.abs(s * rng.gauss()))));
    const mean = draws.reduce((a, b) => a + b, 0) / draws.length;
    const sd = Math.sqrt(draws.reduce((a, b) => a + (b - mean) ** 2, 0) / draws.length);
    expect(Math.abs(m.mean - mean)).toBeLessThan((3 * sd) / Math.sqrt(draws.length));
    expect(Math.abs(draws.filter((d) => d <= 0.5).length / draws.length - m.within(0.5))).toBeLessThan(0.025);
  });
});

describe('a layer\'s bound is what a maximum-likelihood fit reaches', () => {
  // Layer 2 (L on H, 2000 samples) of the spikes mirror's first seed, without the spikes: the
  // simulator's detector noise (white 0.03 % + AR(1) 0.06 %, 1 s) drawn afresh 60 times on its
  // true signal, each fitted by Gauss–Newton on the whitened residuals (the exact likelihood).
  it('σ of the fitted thickness over noise draws within 25 % of σ_CRB', { timeout: 120_000 }, () => {
    const s = scenarios().find((x) => x.name === 'correlated noise and spikes, mirror')!;
    const options = { ...s.options, spikes: undefined };
    const run = simulateChamberRun(s.design, { ...options, seed: s.seeds[0] });
    const truth = run.truth.layers[1];
    const bound = layerBound(s.design, options, run, truth);
    const model = layerSignalModel(s.design, options, run, truth);
    const clean = model.signal(model.theta);
    const noiseModel = { whiteSigma: 0.0003, ar1Sigma: 0.0006, rho: Math.exp(-0.1) };
    const free = [0, 1, 2, 3];
    const ends: number[] = [], olsEnds: number[] = [];
    const white = { whiteSigma: 1, ar1Sigma: 0, rho: 0 };
    for (let draw = 0; draw < 60; draw++) {
      const det = new Detector({ gain: 1, lampDriftPerHour: 0, darkOffset: 0, strayFraction: 0, whiteNoise: 0.0003, correlatedNoise: { fraction: 0.0006, correlationS: 1 } },
        0.1, chamberRng(100 + draw).fork('white'), chamberRng(100 + draw).fork('correlated'), chamberRng(100 + draw).fork('spikes'));
      const y = clean.map((v, i) => v + det.reading(0, i * 0.1));
      for (const [noise, out] of [[noiseModel, ends], [white, olsEnds]] as const) {
        let theta = [...model.theta];
        for (let it = 0; it < 4; it++) {
          const pred = model.signal(theta);
          const [rw, ...jw] = whiten([y.map((v, i) => v - pred[i]), ...jacobianColumns(model, free, theta)], noise);
          const normal = jw.map((a) => jw.map((b) => a.reduce((sum, v, i) => sum + v * b[i], 0)));
          const rhs = jw.map((a) => a.reduce((sum, v, i) => sum + v * rw[i], 0));
          const inv = invert(normal);
          theta = theta.map((t, p) => t + inv[p].reduce((sum, v, q) => sum + v * rhs[q], 0));
        }
        out.push(theta[1] * model.tauEndS + 0.5 * theta[2] * model.tauEndS ** 2);
      }
    }
    const rmsOf = (v: number[]) => Math.sqrt(v.reduce((a, d) => a + (d - model.endNm) ** 2, 0) / v.length);
    const rmsErr = rmsOf(ends);
    console.log(`ML fit: RMS error ${rmsErr.toFixed(4)} nm, unweighted fit ${rmsOf(olsEnds).toFixed(4)} nm, σ_CRB ${bound.thicknessSigmaNm.toFixed(4)} nm`);
    expect(bound.thicknessSigmaNm / model.endNm).toBeGreaterThan(0.001);
    expect(rmsErr / bound.thicknessSigmaNm).toBeGreaterThan(0.75);
    expect(rmsErr / bound.thicknessSigmaNm).toBeLessThan(1.25);
  });
});

describe('the bound code', () => {
  it('imports nothing from analysis/ (only the simulator and its own files)', () => {
    const dir = path.resolve(import.meta.dirname, '../harness');
    for (const f of ['cramerRao.ts', 'layerBound.ts', 'chipBound.ts', 'wanderBound.ts']) {
      const imports = [...readFileSync(path.join(dir, f), 'utf8').matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]);
      for (const spec of imports) expect(spec, `${f} imports ${spec}`).toMatch(/^\.\.?\/(cramerRao|layerBound|design|options|thinFilm)$/);
    }
  });

  // freeing parameters never lowers a bound (a theorem); B under A is measured here, not a theorem:
  // B has more data but the stack below unknown
  it('the whole chip\'s bound: under each layer\'s own on this chip, and no lower with the growths free', { timeout: 60_000 }, () => {
    const s = scenarios().find((x) => x.name === 'correlated noise and spikes, mirror')!;
    const run = simulateChamberRun(s.design, { ...s.options, seed: s.seeds[0] });
    const known = chipBound(s.design, s.options, run, 2), free = chipBound(s.design, s.options, run, 2, { growth: 'free' });
    expect(known.map((b) => b.layer)).toEqual([7, 8, 9, 10, 11, 12]);
    known.forEach((b, j) => {
      const own = layerBound(s.design, s.options, run, run.truth.layers[b.layer - 1]);
      expect(b.thicknessSigmaNm).toBeLessThanOrEqual(own.thicknessSigmaNm * 1.0001);
      expect(b.indexSigma).toBeLessThanOrEqual(own.indexSigma * 1.0001);
      expect(free[j].thicknessSigmaNm).toBeGreaterThanOrEqual(b.thicknessSigmaNm * 0.9999);
    });
  });

  // a prior adds information (never raises a bound) and a known parameter is a vanishing prior's
  // limit; tying parameters (one index per material) is a constraint, which never raises one either
  it('the whole chip\'s bound with the thin layers\' index told: known ≤ prior ≤ free, a vanishing prior is known, a wide one free', { timeout: 60_000 }, () => {
    const s = scenarios().find((x) => x.name === 'thin level-cut layers (R)')!;
    const run = simulateChamberRun(s.design, { ...s.options, seed: s.seeds[0] });
    const free = chipBound(s.design, s.options, run, 1), wide = chipBound(s.design, s.options, run, 1, { thinIndex: 10 });
    const prior = chipBound(s.design, s.options, run, 1, { thinIndex: 0.0064 }), known = chipBound(s.design, s.options, run, 1, { thinIndex: 0 });
    const narrow = chipBound(s.design, s.options, run, 1, { thinIndex: 1e-7 }), shared = chipBound(s.design, s.options, run, 1, { sharedIndex: true });
    const noDrift = chipBound(s.design, s.options, run, 1, { rateDrift: false });
    free.forEach((b, j) => {
      expect(wide[j].thicknessSigmaNm / b.thicknessSigmaNm).toBeCloseTo(1, 4);
      expect(narrow[j].thicknessSigmaNm / known[j].thicknessSigmaNm).toBeCloseTo(1, 4);
      expect(prior[j].thicknessSigmaNm).toBeLessThanOrEqual(b.thicknessSigmaNm * 1.0001);
      expect(known[j].thicknessSigmaNm).toBeLessThanOrEqual(prior[j].thicknessSigmaNm * 1.0001);
      expect(shared[j].indexSigma).toBeLessThanOrEqual(b.indexSigma * 1.0001);
      expect(noDrift[j].thicknessSigmaNm).toBeLessThanOrEqual(b.thicknessSigmaNm * 1.0001);
    });
    // the 0.8-QWOT layer 5 on the thin L layer 4: what the held index gives it
    expect(known[4].thicknessSigmaNm).toBeLessThan(0.5 * free[4].thicknessSigmaNm);
    expect(known[0].indexSigma).toBe(0);
  });

  it('the whole chip\'s wander bound: a vanishing wander gives B, the block length hardly matters, the wander widens it', { timeout: 60_000 }, () => {
    const s = scenarios().find((x) => x.name === 'correlated noise and rate wander, mirror')!;
    const run = simulateChamberRun(s.design, { ...s.options, seed: s.seeds[0] });
    const plain = chipBound(s.design, s.options, run, 2);
    const none = chipBound(s.design, { ...s.options, rateWander: { fraction: 1e-7, correlationS: 15 } }, run, 2, { wanderBlockS: 5 });
    const coarse = chipBound(s.design, s.options, run, 2, { wanderBlockS: 5 }), fine = chipBound(s.design, s.options, run, 2, { wanderBlockS: 2.5 });
    plain.forEach((b, j) => {
      expect(none[j].thicknessSigmaNm / b.thicknessSigmaNm).toBeCloseTo(1, 3);
      expect(coarse[j].thicknessSigmaNm / fine[j].thicknessSigmaNm).toBeCloseTo(1, 1);
      expect(coarse[j].thicknessSigmaNm).toBeGreaterThan(b.thicknessSigmaNm);
      // and under the layer's own wander bound: the next layer pins the end
      expect(coarse[j].thicknessSigmaNm).toBeLessThan(wanderBoundNm(s.design, s.options, run, run.truth.layers[b.layer - 1], 0.005, 5) * 1.0001);
    });
  });

  // the lamp's drift as a parameter: its prior adds information to a free γ, so a vanishing prior is
  // the known drift's limit and a wider one never lowers a bound (freeing a parameter never does)
  it('the whole chip\'s bound with the lamp\'s drift a parameter (a vanishing prior is the known drift, a wider one never lower) and the start-up\'s time constant freed', { timeout: 60_000 }, () => {
    const s = scenarios().find((x) => x.name === 'real chamber, BBAR')!;
    const run = simulateChamberRun(s.design, { ...s.options, seed: s.seeds[0] });
    const known = chipBound(s.design, s.options, run, 1, { thinIndex: 0 });
    const narrow = chipBound(s.design, s.options, run, 1, { thinIndex: 0, lampDriftSigmaPerHour: 1e-7 });
    const prior = chipBound(s.design, s.options, run, 1, { thinIndex: 0, lampDriftSigmaPerHour: 0.01 });
    const wide = chipBound(s.design, s.options, run, 1, { thinIndex: 0, lampDriftSigmaPerHour: 0.05 });
    known.forEach((b, j) => {
      // (not to the last digit: with γ a parameter the model's gain moves with time, −1 %/h here, where the plain one holds it)
      expect(narrow[j].thicknessSigmaNm / b.thicknessSigmaNm).toBeCloseTo(1, 2);
      expect(prior[j].thicknessSigmaNm).toBeGreaterThanOrEqual(narrow[j].thicknessSigmaNm * 0.9999);
      expect(wide[j].thicknessSigmaNm).toBeGreaterThanOrEqual(prior[j].thicknessSigmaNm * 0.9999);
      expect(wide[j].indexSigma).toBeGreaterThanOrEqual(prior[j].indexSigma * 0.9999);
    });
    // the last layer (1.03 QWOT, cut on level just past its turning point) reads the drift most
    expect(prior[3].indexSigma).toBeGreaterThan(2 * known[3].indexSigma);
    // the start-up as the shutter opens in the law: its time constant freed never lowers a bound,
    // and a law with the start-up at its truth stays near the one without (the lag is ~1.5 s of minutes)
    const rampKnown = chipBound(s.design, s.options, run, 1, { thinIndex: 0, lampDriftSigmaPerHour: 0.01, ramp: 'known' });
    const rampFree = chipBound(s.design, s.options, run, 1, { thinIndex: 0, lampDriftSigmaPerHour: 0.01, ramp: 'free' });
    rampKnown.forEach((b, j) => {
      expect(rampFree[j].thicknessSigmaNm).toBeGreaterThanOrEqual(b.thicknessSigmaNm * 0.9999);
      expect(rampFree[j].indexSigma).toBeGreaterThanOrEqual(b.indexSigma * 0.9999);
      expect(b.thicknessSigmaNm / prior[j].thicknessSigmaNm).toBeCloseTo(1, 1);
    });
  });

  it('the wander bound: a vanishing wander gives the plain bound; the scenario\'s wander widens it', { timeout: 60_000 }, () => {
    const s = scenarios().find((x) => x.name === 'correlated noise and rate wander, mirror')!;
    const run = simulateChamberRun(s.design, { ...s.options, seed: s.seeds[0] });
    const truth = run.truth.layers[1];
    const plain = layerBound(s.design, s.options, run, truth, { gain: 0.005 }).thicknessSigmaNm;
    const none = wanderBoundNm(s.design, { ...s.options, rateWander: { fraction: 1e-7, correlationS: 15 } }, run, truth);
    expect(none / plain).toBeCloseTo(1, 4);
    // what the wander alone moves the end by, a priori: Var ∫₀ᵀ w = 2σ²τ_c[T − τ_c(1 − e^(−T/τ_c))]
    // for an Ornstein–Uhlenbeck w (from memory); the samples pin part of it, never more than all
    const T = layerSignalModel(s.design, s.options, run, truth).tauEndS, tc = 15;
    const priorNm = (truth.thicknessNm / T) * Math.sqrt(2 * 0.015 ** 2 * tc * (T - tc * (1 - Math.exp(-T / tc))));
    const wander = wanderBoundNm(s.design, s.options, run, truth);
    expect(wander / plain).toBeGreaterThan(1.2);
    expect(wander).toBeLessThan(Math.hypot(priorNm, plain));
  });
});
