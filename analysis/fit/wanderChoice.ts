import { type LayerAt } from '../optics';
import { fitAr1PlusWhiteSums, whitenAr1PlusWhite, type VariogramPool } from '../stats';
import { paramLayout, type FitLayerData, type LayerParams } from './layerModel';
import { type LayerEstimate } from './fitLayers';
import { invertSymmetric } from './invertSymmetric';
import { rateWander, wanderBasis, wanderCount, wanderKnots, type RateWander } from './rateWander';
import { prepareRateWander, WANDER_CORRELATIONS_S, type WanderPrep } from './wanderPrep';
import { type StackCovariance } from './stackUncertainty';

export { WANDER_CORRELATIONS_S };

/** The wander scales tried, as fractions of the rate (0: the plain quadratic law). */
export const WANDER_FRACTIONS = [0, 0.0025, 0.005, 0.01, 0.02, 0.04];

const HUBER_K = 2.5;
/** Hyperparameters a wander's choice estimates (σ_w, and the correlation time when more than one is tried). */
export const WANDER_HYPERPARAMETERS = WANDER_CORRELATIONS_S.length > 1 ? 2 : 1;
const GRAM_STRIDE = 2;

export interface WanderChoiceInput {
  below: readonly LayerAt[];
  /** The layer's fit data (bin means) without wander. */
  layer: FitLayerData;
  /** The plain fit's solution. */
  estimate: LayerParams;
  offsetSignal: number;
  /** σ of the Gaussian prior on a free per-layer gain (see fitLayers' gainPrior), 0 without. */
  gainPriorSigma: number;
  /** Every sample of the layer (time from its start, reading), for the noise's long-run σ. */
  allTauS: Float64Array;
  allY: Float64Array;
  /**
   * The covariance of the chip's layers fitted so far (the last entries of `below`), when known
   * (sequential): their errors bend this layer's fringes too, and both candidates carry them.
   */
  stack?: StackCovariance;
  /** The layer just below's thickness was read from this layer's start (growthFromNext): free in both candidates. */
  growthFromHere?: boolean;
  /** The run's pooled variogram (bins of SAMPLES_PER_BIN samples), added to and read. */
  noisePool?: VariogramPool;
}

export interface WanderChoice {
  /** The chosen wander with pointSigma per sample (scale it by √(points/samples) per fit), or null for the plain law. */
  wander: RateWander | null;
  /** Long-run σ of one sample of the noise (white-equivalent at low frequency). */
  sampleSigma: number;
  /** −2·log restricted likelihood per candidate (fraction 0 once), and the noise's profiled scale² there. */
  scores: { fraction: number; correlationS: number; score: number; scale2: number }[];
}

/**
 * Whether the layer's rate wandered, and how much: the wander's prior scale σ_w and correlation
 * time are chosen by maximising the restricted (marginal) likelihood of the fit's linearised
 * model at the plain solution, y − f(θ̂) ≈ X·δθ + Z·c + e, θ flat, c ~ N(0, G), e white at the
 * noise's long-run σ: −2·log L = log|A| + log|G| + min(‖r − Xδθ − Zc‖² + cᵀG⁻¹c), A the
 * Hessian of that minimum (the marginal likelihood of a linear mixed model, e.g.
 * D. A. Harville, J. Am. Stat. Assoc. 72, 320–338 (1977); from memory). In the non-centred knots
 * (c = L·v, v unit normal) log|A| + log|G| = log|A′| with A′ the Hessian in (θ, v), which stays
 * finite as σ_w → 0, so the plain law (σ_w = 0) competes on the same score: the data choose more
 * freedom only when it pays for its own volume (the Occam factor of the determinant).
 */
export function chooseRateWander(input: WanderChoiceInput): WanderChoice {
  return finishRateWander(prepareRateWander(input), input.noisePool);
}

/** chooseRateWander from its pool-free part (prepareRateWander, made anywhere), the layers taken in order onto the pool. */
export function finishRateWander(prep: WanderPrep, noisePool?: VariogramPool): WanderChoice {
  const { N, per } = prep;
  const scores: WanderChoice['scores'] = [];
  const noise = fitAr1PlusWhiteSums(prep.variogram, noisePool);
  const none = { wander: null, sampleSigma: noise.longRunSigma * Math.sqrt(per), scores };
  if (N < 100 || !(noise.longRunSigma > 0)) return none;
  let best = { score: Infinity, kappa: 0, correlationS: 0, scale2: 1 };
  let plainScore = Infinity, plainScale2 = 1;
  for (const { correlationS, jac, np, np0, m, wFirst, k } of prep.candidates) {
    const isW = (j: number) => j >= wFirst && j < wFirst + k;
    const isS = (j: number) => j >= np0 && j < np0 + m;
    const pFixed = np - m - k;
    // Generalised least squares: residuals and columns whitened by the noise's own filter.
    const cols = Array.from({ length: np }, (_, j) => jac.subarray(j * N, (j + 1) * N));
    const r = prep.residuals.slice();
    whitenAr1PlusWhite(noise, [r, ...cols]);
    // Huber's pseudo-residuals ψ(r), |r| capped (P. J. Huber, "Robust Statistics", Wiley (1981),
    // §7.8, from memory): a spike does not pass for a wandering rate.
    const rr = huberCappedSquares(r, N);
    // Gram matrix; fixed columns scaled to unit norm (log|XᵀX| shifts every score alike).
    const norm = new Float64Array(np).fill(1);
    for (let j = 0; j < np; j++) {
      if (isW(j) || isS(j)) continue;
      const c = sumOfSquares(jac, j * N, (j + 1) * N);
      norm[j] = c > 0 ? 1 / Math.sqrt(c) : 1;
    }
    // The whitened columns stay smooth (a smooth column through the filter), so their products
    // are summed on every GRAM_STRIDE-th row (times the stride); the data's, which are not, on all.
    const gram = new Float64Array(np * np), b = new Float64Array(np);
    gramWithData(jac, r, np, N, norm, gram, b);
    const gainParam = prep.freeGain ? np0 - 1 : -1;
    // the gain prior's information, for the column scaled by norm
    if (gainParam >= 0 && prep.gainPriorSigma > 0) gram[gainParam * np + gainParam] += (norm[gainParam] / prep.gainPriorSigma) ** 2;
    for (const fraction of WANDER_FRACTIONS) {
      if (fraction === 0 && correlationS !== WANDER_CORRELATIONS_S[0]) continue;
      // κ: the wander's σ per unit of the noise's scale, which is profiled:
      // −2·log L = (N − p)·log(min/(N − p)) + log|A′|, A′ = [XᵀX, κXᵀZ; κZᵀX, κ²ZᵀZ + I].
      const kappa = fraction * Math.abs(prep.rateNmPerS);
      const a = new Float64Array(np * np), g = new Float64Array(np);
      wanderScaled(gram, b, np, kappa, wFirst, k, np0, m, a, g);
      const f = choleskyLogDet(a, np, g);
      if (!f) continue;
      const dof = N - pFixed;
      const min = Math.max(rr - f.quad, 1e-12);
      const score = dof * Math.log(min / dof) + f.logDet;
      scores.push({ fraction, correlationS, score, scale2: min / dof });
      if (fraction === 0) {
        plainScore = score;
        plainScale2 = min / dof;
      }
      if (score < best.score) best = { score, kappa: fraction, correlationS, scale2: min / dof };
    }
  }
  // The wander must beat the plain law by AIC's 2 per hyperparameter it estimates (σ_w and the
  // correlation time; H. Akaike, IEEE Trans. Autom. Control 19, 716–723 (1974)).
  if (!(best.kappa > 0) || !(best.score < plainScore - 2 * WANDER_HYPERPARAMETERS)) {
    return { wander: null, sampleSigma: noise.longRunSigma * Math.sqrt(plainScale2 * per), scores };
  }
  // The noise's long-run σ per sample, with the profiled scale of the chosen model.
  const sampleSigma = noise.longRunSigma * Math.sqrt(best.scale2 * per);
  const wander: RateWander = rateWander({
    knotsS: wanderKnots(prep.durationS, best.correlationS),
    sigmaNmPerS: best.kappa * Math.abs(prep.rateNmPerS) * Math.sqrt(best.scale2),
    correlationS: best.correlationS, pointSigma: sampleSigma,
  });
  return { wander, sampleSigma, scores };
}

/** log|A| and gᵀA⁻¹g for a symmetric positive-definite A (row-major, p×p) by Cholesky; null if not positive definite. */
export function choleskyLogDet(a: Float64Array, p: number, g: Float64Array): { logDet: number; quad: number } | null {
  const l = new Float64Array(p * p);
  let logDet = 0;
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * p + j];
      for (let k = 0; k < j; k++) s -= l[i * p + k] * l[j * p + k];
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * p + i] = Math.sqrt(s);
        logDet += Math.log(s);
      } else l[i * p + j] = s / l[j * p + j];
    }
  }
  // gᵀA⁻¹g = ‖L⁻¹g‖²
  const z = new Float64Array(p);
  let quad = 0;
  for (let i = 0; i < p; i++) {
    let s = g[i];
    for (let k = 0; k < i; k++) s -= l[i * p + k] * z[k];
    z[i] = s / l[i * p + i];
    quad += z[i] * z[i];
  }
  return { logDet, quad };
}

/**
 * What holding the wander costs the end thickness's variance in a one-layer fit (cov: its
 * covariance), nm²: Var(d) − Var(d | v) = uᵀ·C_vv⁻¹·u with u = Cov(v, d), the Schur complement of
 * the Gaussian posterior (the trend and the wander trade off, so the wander's own share would
 * overstate it). Added to a joint fit's σ that holds the knots.
 */
export function wanderEndVariance(layer: FitLayerData, cov: Float64Array): number {
  const k = wanderCount(layer.wander);
  if (k === 0) return 0;
  const np = paramLayout([layer]).count;
  const iR = layer.heldIndex === null ? 1 : 0, first = iR + 1 + (layer.fitDrift ? 1 : 0);
  const T = layer.durationS;
  // d's gradient over θ = [n?, r, a?, v…, g?]
  const grad = new Float64Array(np);
  grad[iR] = T;
  if (layer.fitDrift) grad[iR + 1] = 0.5 * T * T;
  wanderBasis(layer.wander!, T, new Float64Array(k)).forEach((g, j) => (grad[first + j] = g));
  const u = new Float64Array(k), cvv = new Float64Array(k * k);
  for (let a = 0; a < k; a++) {
    let s = 0;
    for (let b = 0; b < np; b++) s += cov[(first + a) * np + b] * grad[b];
    u[a] = s;
    for (let b = 0; b < k; b++) cvv[a * k + b] = cov[(first + a) * np + first + b];
  }
  const inv = invertSymmetric(cvv, k);
  if (!inv) return 0;
  let v = 0;
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) v += u[a] * inv[a * k + b] * u[b];
  return Number.isFinite(v) ? Math.max(0, v) : 0;
}

/** A joint fit's estimate with the held wander's variance added to its thickness σ. */
export function withWanderVariance(e: LayerEstimate, varianceNm2: number): LayerEstimate {
  if (!(varianceNm2 > 0)) return e;
  return {
    ...e,
    thicknessSigmaNm: Math.sqrt(e.thicknessSigmaNm ** 2 + varianceNm2),
    opticalThicknessSigmaNm: Math.sqrt(e.opticalThicknessSigmaNm ** 2 + e.index * e.index * varianceNm2),
  };
}

// The loops over the rows sit in small functions of their own, so the engine optimises each
// with the feedback of its own loop (see trace/robustStats.ts): inline in chooseRateWander, the
// Gram matrix's products took about 0.2 s of the bench's 40-layer run.

/** Σ a[i]² over [from, to). */
function sumOfSquares(a: Float64Array, from: number, to: number): number {
  let c = 0;
  for (let i = from; i < to; i++) c += a[i] * a[i];
  return c;
}

// finishRateWander's loops over rows and matrix entries sit in the small functions below: it runs
// once a layer, and with them inline the engine compiled the whole of it (the same sums).

/** The Gram matrix of the np columns (scaled by norm) into gram, and their products with r into b. */
function gramWithData(jac: Float64Array, r: Float64Array, np: number, N: number, norm: Float64Array, gram: Float64Array, b: Float64Array): void {
  const products = new Float64Array(np);
  for (let a = 0; a < np; a++) {
    b[a] = dotWithColumn(jac, a * N, r, N) * norm[a];
    stridedProductsWith(jac, a, np, N, products);
    for (let c = a; c < np; c++) gram[a * np + c] = gram[c * np + a] = products[c] * norm[a] * norm[c];
  }
}

/**
 * A′ into a and the scaled data's products into g: the wander's columns (wFirst … wFirst + k − 1)
 * scaled by κ, a unit prior on the diagonal of those and of the stack below's (np0 … np0 + m − 1).
 */
function wanderScaled(gram: Float64Array, b: Float64Array, np: number, kappa: number, wFirst: number, k: number, np0: number, m: number, a: Float64Array, g: Float64Array): void {
  const isW = (j: number) => j >= wFirst && j < wFirst + k;
  const isS = (j: number) => j >= np0 && j < np0 + m;
  for (let i = 0; i < np; i++) {
    const si = isW(i) ? kappa : 1;
    g[i] = si * b[i];
    for (let j = 0; j < np; j++) a[i * np + j] = si * (isW(j) ? kappa : 1) * gram[i * np + j];
    if (isW(i) || isS(i)) a[i * np + i] += 1;
  }
}

/** Caps each of r's first N values at ±HUBER_K in place; returns the sum of their squares (in row order). */
function huberCappedSquares(r: Float64Array, N: number): number {
  let rr = 0;
  for (let i = 0; i < N; i++) {
    r[i] = Math.max(-HUBER_K, Math.min(HUBER_K, r[i]));
    rr += r[i] * r[i];
  }
  return rr;
}

/** Σ jac[oa + i]·r[i] over i < N. */
function dotWithColumn(jac: Float64Array, oa: number, r: Float64Array, N: number): number {
  let q = 0;
  for (let i = 0; i < N; i++) q += jac[oa + i] * r[i];
  return q;
}

/**
 * The products of column a with each column c ≥ a (np columns of N rows in jac), into out[c]:
 * each summed on the first row and every GRAM_STRIDE-th row after it, times the stride (the last
 * of those rows times the rows left, min(stride, N − i)). Four columns a pass, each its own sum in
 * row order, so column a is read once for four products (the figures those of one column at a
 * time). Code the engine may compile on the stack (inside a loop) while code after that loop has
 * never run would leave the compiled code there on one call after another (no type feedback):
 * hence one loop over the rows, the short last stride's weight picked inside it (a loop of its own
 * ran only for some N), and the columns beyond the passes of four done before them.
 */
export function stridedProductsWith(jac: Float64Array, a: number, np: number, N: number, out: Float64Array): void {
  const oa = a * N;
  // the columns beyond the last pass of four first: nothing after the loop of passes
  for (let c = np - ((np - a) % 4); c < np; c++) out[c] = stridedProduct(jac, oa, c * N, N);
  for (let c = a; c + 4 <= np; c += 4) {
    const o0 = c * N, o1 = o0 + N, o2 = o1 + N, o3 = o2 + N;
    const x = jac[oa];
    let t0 = x * jac[o0], t1 = x * jac[o1], t2 = x * jac[o2], t3 = x * jac[o3];
    for (let i = 1; i < N; i += GRAM_STRIDE) {
      const u = jac[oa + i], left = N - i, w = left < GRAM_STRIDE ? left : GRAM_STRIDE;
      t0 += u * jac[o0 + i] * w;
      t1 += u * jac[o1 + i] * w;
      t2 += u * jac[o2 + i] * w;
      t3 += u * jac[o3 + i] * w;
    }
    out[c] = t0;
    out[c + 1] = t1;
    out[c + 2] = t2;
    out[c + 3] = t3;
  }
}

/**
 * One column's product of stridedProductsWith (the columns left over by the passes of four), in
 * a function of its own, so its loop is compiled with its own type feedback.
 */
function stridedProduct(jac: Float64Array, oa: number, oc: number, N: number): number {
  let t = jac[oa] * jac[oc];
  for (let i = 1; i < N; i += GRAM_STRIDE) {
    const left = N - i;
    t += jac[oa + i] * jac[oc + i] * (left < GRAM_STRIDE ? left : GRAM_STRIDE);
  }
  return t;
}
