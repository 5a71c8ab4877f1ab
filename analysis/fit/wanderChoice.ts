import { type LayerAt } from '../optics';
import { longRunSigma } from '../trace';
import { encodeLayer, evaluateLayers, jacobianLayers, paramLayout, type FitLayerData, type LayerParams } from './layerModel';
import { wanderKnots, type RateWander } from './rateWander';

/** The wander scales tried, as fractions of the rate (0: the plain quadratic law). */
export const WANDER_FRACTIONS = [0, 0.0025, 0.005, 0.01, 0.02, 0.04];
/** The wander correlation times tried, s (knots one correlation time apart). */
export const WANDER_CORRELATIONS_S = [10, 30];

export interface WanderChoiceInput {
  below: readonly LayerAt[];
  /** The layer's fit data (bin means) without wander. */
  layer: FitLayerData;
  /** The plain fit's solution. */
  estimate: LayerParams;
  offsetSignal: number;
  /** The prior weight c of a free per-layer gain (see fitLayers' gainPrior), 0 without. */
  gainPriorWeight: number;
  /** Every sample of the layer (time from its start, reading), for the noise's long-run σ. */
  allTauS: Float64Array;
  allY: Float64Array;
}

export interface WanderChoice {
  /** The chosen wander with pointSigma per sample (scale it by √(points/samples) per fit), or null for the plain law. */
  wander: RateWander | null;
  /** Long-run σ of one sample of the noise (white-equivalent at low frequency). */
  sampleSigma: number;
  /** −2·log restricted likelihood per candidate (fraction 0 once). */
  scores: { fraction: number; correlationS: number; score: number }[];
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
  const { below, layer, estimate, offsetSignal } = input;
  // The noise's long-run σ from the plain fit's residuals on every sample (a wander's misfit is
  // slow; the short-lag differences longRunSigma reads hardly see it).
  const full: FitLayerData = { ...layer, tauS: input.allTauS, y: input.allY, weight: 1, wander: undefined };
  const l0 = paramLayout([full]);
  const p0: number[] = [];
  encodeLayer(full, estimate, p0);
  const modelAll = new Float64Array(input.allTauS.length);
  evaluateLayers(below, [full], l0, p0, offsetSignal, modelAll);
  const res = Float64Array.from(input.allY, (v, i) => v - modelAll[i]);
  const sampleSigma = longRunSigma(res);
  const n = layer.tauS.length;
  const pointSigma = sampleSigma * Math.sqrt(n / input.allTauS.length);
  const scores: WanderChoice['scores'] = [];
  if (!(pointSigma > 0) || n < 20) return { wander: null, sampleSigma, scores };
  const plain: FitLayerData = { ...layer, weight: 1, wander: undefined };
  const at = new Float64Array(n);
  evaluateLayers(below, [plain], l0, p0, offsetSignal, at);
  const r = Float64Array.from(layer.y, (v, i) => (v - at[i]) / pointSigma);
  let best = { score: Infinity, fraction: 0, correlationS: 0 };
  for (const correlationS of WANDER_CORRELATIONS_S) {
    const wander: RateWander = { knotsS: wanderKnots(layer.durationS, correlationS), sigmaNmPerS: 1, correlationS, pointSigma };
    const withW: FitLayerData = { ...plain, wander };
    const layout = paramLayout([withW]);
    const p: number[] = [];
    encodeLayer(withW, estimate, p);
    const np = layout.count;
    const steps = Float64Array.from(p, (v) => 1e-6 * Math.max(Math.abs(v), 1e-3));
    const jac = new Float64Array(np * n);
    jacobianLayers(below, [withW], layout, Float64Array.from(p), offsetSignal, at, steps, jac);
    const wFirst = (withW.heldIndex === null ? 1 : 0) + 1 + (withW.fitDrift ? 1 : 0), k = wander.knotsS.length;
    const isW = (j: number) => j >= wFirst && j < wFirst + k;
    // Gram matrix of the columns (rows in units of the point σ); plain columns scaled to unit norm.
    const norm = new Float64Array(np).fill(1 / pointSigma);
    for (let j = 0; j < np; j++) {
      if (isW(j)) continue;
      let c = 0;
      for (let i = 0; i < n; i++) c += jac[j * n + i] ** 2;
      norm[j] = c > 0 ? 1 / Math.sqrt(c) : 1;
    }
    const gram = new Float64Array(np * np), b = new Float64Array(np);
    for (let a = 0; a < np; a++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += jac[a * n + i] * r[i];
      b[a] = s * norm[a];
      for (let c = a; c < np; c++) {
        let t = 0;
        for (let i = 0; i < n; i++) t += jac[a * n + i] * jac[c * n + i];
        gram[a * np + c] = gram[c * np + a] = t * norm[a] * norm[c];
      }
    }
    const gainParam = plain.heldGain === null ? np - 1 : -1;
    if (gainParam >= 0 && input.gainPriorWeight > 0) gram[gainParam * np + gainParam] += (input.gainPriorWeight * norm[gainParam]) ** 2;
    const rr = r.reduce((s, v) => s + v * v, 0);
    for (const fraction of WANDER_FRACTIONS) {
      if (fraction === 0 && correlationS !== WANDER_CORRELATIONS_S[0]) continue;
      const sigma = fraction * Math.abs(estimate.rateNmPerS);
      // A′ = [XᵀX, σXᵀZ; σZᵀX, σ²ZᵀZ + I], b′ = [Xᵀr; σZᵀr]
      const a = new Float64Array(np * np), g = new Float64Array(np);
      for (let i = 0; i < np; i++) {
        const si = isW(i) ? sigma : 1;
        g[i] = si * b[i];
        for (let j = 0; j < np; j++) a[i * np + j] = si * (isW(j) ? sigma : 1) * gram[i * np + j];
        if (isW(i)) a[i * np + i] += 1;
      }
      const f = choleskyLogDet(a, np, g);
      if (!f) continue;
      const score = f.logDet + rr - f.quad;
      scores.push({ fraction, correlationS, score });
      if (score < best.score) best = { score, fraction, correlationS };
    }
  }
  if (!(best.fraction > 0)) return { wander: null, sampleSigma, scores };
  const wander: RateWander = {
    knotsS: wanderKnots(layer.durationS, best.correlationS), sigmaNmPerS: best.fraction * Math.abs(estimate.rateNmPerS),
    correlationS: best.correlationS, pointSigma: sampleSigma,
  };
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
