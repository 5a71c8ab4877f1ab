import { type LayerEstimate, type SharedGain } from './fitLayers';
import { type GaussianEvidence, type GrowthEstimate } from './growthPosterior';
import { invertSymmetric } from './invertSymmetric';
import { decodeLayer, encodeLayer, evaluateLayers, jacobianLayers, paramLayout, type FitLayerData } from './layerModel';
import { lawRate, lawThickness, wanderBasis, wanderCount } from './rateWander';

export interface JointGrowthInput {
  /** The chip's layers as in its joint fit (time bases with the current growth), and the fit's estimates. */
  data: readonly FitLayerData[];
  estimates: readonly LayerEstimate[];
  sharedGain: SharedGain | null;
  offsetSignal: number;
  /** Per layer: its time base at the last logged sample and its current growth, nm; null for a layer without a growth parameter (the chip's last). */
  growth: readonly ({ loggedS: number; deltaNm: number } | null)[];
  /** The growth's final estimate from the joint fit's Gaussian (bounds, the idle level). */
  finalize: (layer: number, joint: GaussianEvidence) => GrowthEstimate;
}

export interface JointGrowthLayer {
  estimate: LayerEstimate;
  /** The layer's growth (null where it had no parameter), and its time base with the growth. */
  growth: GrowthEstimate | null;
  durationS: number;
}

/**
 * The growth after each cut of a chip, re-estimated with its joint fit: one Gauss–Newton step
 * from the converged joint fit with each layer's growth δ as one more parameter (it changes
 * only the later layers' curves: where each starts on its fringe). In the sequential pass a
 * layer's growth is read against the stack as then estimated, so it also absorbs that stack's
 * error; with every layer fitted jointly the stack is known far better, and the growth must be
 * read again against it. The gradient in the fit's own parameters θ is zero at its solution, so
 * the step is Δ = A⁻¹·(0, J_δᵀr) with A the normal matrix of (θ, δ); the covariance is
 * s²·A⁻¹, scaled for correlated noise per layer as the joint fit's. Each δ's marginal then goes
 * through `finalize` (the bound δ ≥ 0, the idle level), and θ follows it by Gaussian
 * conditioning: θ = θ̂ + K·(δ − δ̂), Cov θ = C_θθ − K·C_δθ + K·P·Kᵀ with K = C_θδ·C_δδ⁻¹ and P the
 * final δ covariance (C. M. Bishop, Pattern Recognition and Machine Learning (2006), §2.3.1;
 * from memory). A wander's knots (option rateWander) are free here under their prior, as in the
 * joint fit, and their share of the end thickness stays in its σ: held at the fit's values they
 * dropped out of it (rate-wander mirror, refit, seeds 15–30: RMS z 1.86 → 1.49).
 * Null when the normal matrix is singular.
 */
export function jointGrowth(input: JointGrowthInput): JointGrowthLayer[] | null {
  const { data, estimates, sharedGain, offsetSignal } = input;
  const shared = sharedGain !== null;
  const layout = paramLayout(data, shared, sharedGain?.fitDrift ?? false);
  const np = layout.count;
  const p = new Float64Array(np);
  {
    const v: number[] = [];
    data.forEach((l, j) => encodeLayer(l, estimates[j], v, shared));
    if (sharedGain) {
      v.push(sharedGain.gain);
      if (sharedGain.fitDrift) v.push(sharedGain.driftPerS);
    }
    p.set(v);
  }
  const grown = input.growth.map((g, j) => (g && j + 1 < data.length ? j : -1)).filter((j) => j >= 0);
  const m = grown.length;
  if (m === 0) return null;
  const M = np + m;
  let N = 0;
  for (const l of data) N += l.tauS.length;
  const at = new Float64Array(N);
  evaluateLayers([], data, layout, p, offsetSignal, at);
  const J = new Float64Array(M * N);
  const steps = new Float64Array(np);
  for (let k = 0; k < np; k++) steps[k] = 1e-6 * Math.max(Math.abs(p[k]), 1e-6);
  jacobianLayers([], data, layout, p, offsetSignal, at, steps, J.subarray(0, np * N));
  // ∂model/∂δ_j: the layer's time base moved by h at its final rate (central differences).
  const h = 0.01;
  const plus = new Float64Array(N), minus = new Float64Array(N);
  grown.forEach((j, c) => {
    const e = estimates[j];
    const dt = h / Math.max(lawRate(e, data[j].wander, data[j].durationS), 1e-9);
    const moved = (s: number) => data.map((l, i) => (i === j ? { ...l, durationS: l.durationS + s * dt } : l));
    plus.set(at);
    minus.set(at);
    evaluateLayers([], moved(1), layout, p, offsetSignal, plus, j + 1);
    evaluateLayers([], moved(-1), layout, p, offsetSignal, minus, j + 1);
    centralDifference(plus, minus, h, J, (np + c) * N);
  });
  const r = new Float64Array(N);
  let pos = 0, ssr = 0;
  for (const l of data) {
    ssr = residualsInto(l.y, l.weight ?? 1, at, pos, r, ssr);
    pos += l.y.length;
  }
  // A column is zero before its layer's samples (a growth's: before the next layer's): each
  // product runs from the later of the two first non-zero rows, the same sum.
  const first = new Int32Array(M);
  for (let a = 0; a < M; a++) first[a] = firstNonZero(J, a * N, N);
  const A = new Float64Array(M * M);
  for (let a = 0; a < M; a++) {
    for (let b = a; b < M; b++) A[a * M + b] = A[b * M + a] = columnProduct(J, a * N, b * N, Math.max(first[a], first[b]), N);
  }
  // The gain drift's prior row (as in the joint fit): its c² on γ's diagonal.
  const priorWeight = sharedGain?.fitDrift ? sharedGain.driftPrior?.weight : undefined;
  if (priorWeight !== undefined && layout.sharedDrift >= 0) A[layout.sharedDrift * M + layout.sharedDrift] += priorWeight ** 2;
  // A wander's free knots: their unit-normal prior rows (as in the joint fit), so the growth and
  // the wander at the layer's end trade off here as they do in the data.
  data.forEach((l, j) => {
    const k = wanderCount(l.wander);
    const first = layout.offsets[j] + (l.heldIndex === null ? 1 : 0) + 1 + (l.fitDrift ? 1 : 0);
    for (let i = 0; i < k; i++) A[(first + i) * M + first + i] += ((l.weight ?? 1) * l.wander!.pointSigma) ** 2;
  });
  const inv = invertSymmetric(A, M);
  if (!inv) return null;
  const g = new Float64Array(M);
  for (let c = 0; c < m; c++) g[np + c] = columnDot(J, (np + c) * N, r, N);
  const step = new Float64Array(M);
  for (let a = 0; a < M; a++) for (let b = np; b < M; b++) step[a] += inv[a * M + b] * g[b];
  // Covariance: s²·A⁻¹, each parameter scaled by √τ of the layer whose data carry it (a growth: the next layer's).
  const s2 = ssr / Math.max(N - M, 1);
  const f = new Float64Array(M);
  const tauOf = (j: number) => Math.max(1, estimates[j].noiseCorrelation);
  let pooled = 0;
  data.forEach((l, j) => (pooled += tauOf(j) * l.tauS.length));
  f.fill(Math.sqrt(pooled / N));
  data.forEach((_, j) => {
    const next = j + 1 < data.length ? layout.offsets[j + 1] : shared ? layout.shared : np;
    for (let k = layout.offsets[j]; k < next; k++) f[k] = Math.sqrt(tauOf(j));
  });
  grown.forEach((j, c) => (f[np + c] = Math.sqrt(tauOf(j + 1))));
  const C = (a: number, b: number) => s2 * f[a] * f[b] * inv[a * M + b];

  const theta = Float64Array.from(p, (v, k) => v + step[k]);
  const deltaHat = grown.map((j, c) => input.growth[j]!.deltaNm + step[np + c]);
  const final = grown.map((j, c) => input.finalize(j, { meanNm: deltaHat[c], sigmaNm: Math.sqrt(Math.max(C(np + c, np + c), 0)) }));
  // K = C_θδ·C_δδ⁻¹
  const Cdd = new Float64Array(m * m);
  for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) Cdd[a * m + b] = C(np + a, np + b);
  const CddInv = invertSymmetric(Cdd, m);
  if (!CddInv) return null;
  const K = new Float64Array(np * m);
  for (let a = 0; a < np; a++) for (let b = 0; b < m; b++) {
    let s = 0;
    for (let c = 0; c < m; c++) s += C(a, np + c) * CddInv[c * m + b];
    K[a * m + b] = s;
  }
  for (let a = 0; a < np; a++) for (let c = 0; c < m; c++) theta[a] += K[a * m + c] * (final[c].deltaNm - deltaHat[c]);
  // Posterior covariance of (θ, δ), P diagonal (each δ finalized on its own).
  const cov = (a: number, b: number): number => {
    if (a >= np && b >= np) return a === b ? final[a - np].sigmaNm ** 2 : 0;
    if (a >= np) return cov(b, a);
    if (b >= np) return K[a * m + (b - np)] * final[b - np].sigmaNm ** 2;
    let v = C(a, b);
    for (let c = 0; c < m; c++) {
      v -= K[a * m + c] * C(np + c, b);
      v += K[a * m + c] * K[b * m + c] * final[c].sigmaNm ** 2;
    }
    return v;
  };
  // A safeguard for the linear step: the fit at the new values must be as good as the old one
  // but for the pull of the growths' bounds and priors (about one unit of χ² each).
  {
    const moved = data.map((l, j) => {
      const c = grown.indexOf(j);
      if (c < 0) return l;
      const v = decodeLayer(l, theta, layout.offsets[j], layout);
      const rate = Math.max(lawRate(v, l.wander, input.growth[j]!.loggedS), 1e-9);
      return { ...l, durationS: input.growth[j]!.loggedS + final[c].deltaNm / rate };
    });
    const after = new Float64Array(N);
    evaluateLayers([], moved, layout, theta, offsetSignal, after);
    let ssrAfter = 0;
    pos = 0;
    for (const l of data) {
      ssrAfter = squaredResidualsAfter(l.y, l.weight ?? 1, after, pos, ssrAfter);
      pos += l.y.length;
    }
    if (!(ssrAfter <= ssr + (2 * m + 10) * s2 * Math.max(...f) ** 2)) return null;
  }
  return data.map((layer, j) => {
    const e = estimates[j];
    const v = decodeLayer(layer, theta, layout.offsets[j], layout);
    let i = layout.offsets[j];
    const iN = layer.heldIndex === null ? i++ : -1;
    const iR = i++;
    const iA = layer.fitDrift ? i++ : -1;
    const c = grown.indexOf(j);
    const iD = c >= 0 ? np + c : -1;
    const loggedS = c >= 0 ? input.growth[j]!.loggedS : layer.durationS;
    const T = loggedS;
    const delta = c >= 0 ? final[c].deltaNm : 0;
    const d = lawThickness(v, layer.wander, T) + delta;
    // Gradients of d and n·d in (n, r, a, δ, and the wander's free knots: Ψ_k(T)).
    const wk = wanderCount(layer.wander);
    const psi = wk > 0 ? Array.from(wanderBasis(layer.wander!, T, new Float64Array(wk))) : [];
    const idx = [iN, iR, iA, iD, ...psi.map((_, x) => i + x)];
    const gd = [0, T, 0.5 * T * T, 1, ...psi];
    const gnd = [d, v.index * T, 0.5 * v.index * T * T, v.index, ...psi.map((x) => v.index * x)];
    const q = (u: number[], w: number[]) => {
      let s = 0;
      for (let x = 0; x < idx.length; x++) for (let y = 0; y < idx.length; y++) if (idx[x] >= 0 && idx[y] >= 0) s += u[x] * w[y] * cov(idx[x], idx[y]);
      return Math.sqrt(Math.max(s, 0));
    };
    const sd = (k: number) => (k < 0 ? 0 : Math.sqrt(Math.max(cov(k, k), 0)));
    const estimate: LayerEstimate = {
      ...e, index: v.index, rateNmPerS: v.rateNmPerS, rateDriftNmPerS2: v.rateDriftNmPerS2, ...(wk > 0 && v.wander ? { wander: v.wander } : {}),
      ...(v.indexGradient !== undefined ? { indexGradient: v.indexGradient } : {}),
      indexSigma: iN >= 0 ? sd(iN) : e.indexSigma, rateSigma: sd(iR), rateDriftSigma: sd(iA),
      thicknessNm: d, thicknessSigmaNm: q(gd, gd), opticalThicknessNm: v.index * d, opticalThicknessSigmaNm: q(gnd, gnd),
    };
    const growth = c >= 0 ? final[c] : null;
    const finalRate = Math.max(lawRate(v, layer.wander, T), 1e-9);
    return { estimate, growth, durationS: growth ? T + growth.deltaNm / finalRate : layer.durationS };
  });
}

// The loops over every row sit in small functions of their own: jointGrowth runs a few times a
// chip, and its long loops inline made the engine compile the whole function (several times the
// CPU of its runs on the bench's 40-layer run); the sums are the same, term by term.

/** r[pos + i] = w·y[i] − at[pos + i]; returns ssr plus their squares, added in row order. */
function residualsInto(y: ArrayLike<number>, w: number, at: Float64Array, pos: number, r: Float64Array, ssr: number): number {
  for (let i = 0; i < y.length; i++) {
    r[pos + i] = w * y[i] - at[pos + i];
    ssr += r[pos + i] * r[pos + i];
  }
  return ssr;
}

/** ssr plus Σ (w·y[i] − after[pos + i])², in row order. */
function squaredResidualsAfter(y: ArrayLike<number>, w: number, after: Float64Array, pos: number, ssr: number): number {
  for (let i = 0; i < y.length; i++) ssr += (w * y[i] - after[pos + i]) ** 2;
  return ssr;
}

/** The first i < N with J[o + i] ≠ 0 (N if none). */
function firstNonZero(J: Float64Array, o: number, N: number): number {
  let i = 0;
  while (i < N && J[o + i] === 0) i++;
  return i;
}

/** Σ J[o + i]·r[i] over i < N. */
function columnDot(J: Float64Array, o: number, r: Float64Array, N: number): number {
  let s = 0;
  for (let i = 0; i < N; i++) s += J[o + i] * r[i];
  return s;
}

/** J[row + i] = (plus[i] − minus[i])/(2h). */
function centralDifference(plus: Float64Array, minus: Float64Array, h: number, J: Float64Array, row: number): void {
  for (let i = 0; i < plus.length; i++) J[row + i] = (plus[i] - minus[i]) / (2 * h);
}

/** Σ J[oa + i]·J[ob + i] over i in [from, to). */
function columnProduct(J: Float64Array, oa: number, ob: number, from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += J[oa + i] * J[ob + i];
  return s;
}
