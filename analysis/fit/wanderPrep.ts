import { variogramSums, type VariogramSums } from '../stats';
import { binMeans } from './subsample';
import { encodeLayer, evaluateLayers, jacobianLayers, paramLayout, type FitLayerData } from './layerModel';
import { rateWander, wanderKnots, type RateWander } from './rateWander';
import { lastBelowThicknessColumn, stackBelowColumns } from './wanderStackBelow';
import { type WanderChoiceInput } from './wanderChoice';

/** The wander correlation times tried, s (knots one correlation time apart). */
export const WANDER_CORRELATIONS_S = [20];
/**
 * Bins of SAMPLES_PER_BIN samples, and of at least BIN_S: at 10 Hz the same, on a faster trace as
 * many samples as make BIN_S (29 on the bench's 86 Hz run, where bins of three samples, 0.035 s,
 * gave 6700 bins a layer and a variogram to 115 lags: about a third of a second of the second
 * thread's CPU, and the whitening and Gram products of the main one's wander choices on all those
 * rows). A lock-in's noise is correlated over about a second either way, so the bins' noise is
 * white plus AR(1) as at 10 Hz. Bench run, refit: wall 0.91×, CPU 0.88× (10 alternated pairs);
 * 86 Hz seeds 40–44 beyond 3σ as before (1 of 200 indices, 0 of 200 thicknesses), thickness
 * errors within 0.01 % at the worst layer of each run.
 */
const SAMPLES_PER_BIN = 3;
const BIN_S = 0.3;
const NOISE_LAGS_S = 4;

/**
 * The part of a layer's wander choice (chooseRateWander) that does not read the run's variogram
 * pool: the bins, the plain fit's residuals and their variogram, and each candidate's Jacobian
 * columns before whitening. It may be made on any thread, in any order; finishRateWander then
 * takes the layers in order, each onto the pool.
 */
export interface WanderPrep {
  /** Bin count, and samples a bin. */
  N: number;
  per: number;
  /** What the choice reads of its input: the plain fit's rate, the layer's duration, whether its gain is free, and that gain's prior σ. */
  rateNmPerS: number;
  durationS: number;
  freeGain: boolean;
  gainPriorSigma: number;
  /** The plain fit's residuals at the bins. */
  residuals: Float64Array;
  variogram: VariogramSums;
  /** Per correlation time tried: the Jacobian (np columns of N rows), np0 of them the layer's own, m the stack below's, then the growth's and the held gain's. */
  candidates: { correlationS: number; jac: Float64Array; np: number; np0: number; m: number; wFirst: number; k: number }[];
}

/** The pool-free part of chooseRateWander (see WanderPrep). */
export function prepareRateWander(input: Omit<WanderChoiceInput, 'noisePool'>): WanderPrep {
  const { below, layer, estimate, offsetSignal } = input;
  const all = input.allTauS.length;
  // Bin means of SAMPLES_PER_BIN samples and at least BIN_S (a fraction of a lock-in's correlation
  // time, so the bins' noise is still white plus AR(1) and read as such; the same lags in every layer).
  const spanS = all > 1 ? input.allTauS[all - 1] - input.allTauS[0] : 0;
  const perBin = Math.max(SAMPLES_PER_BIN, spanS > 0 ? Math.round((BIN_S * (all - 1)) / spanS) : SAMPLES_PER_BIN);
  const bins = binMeans(input.allTauS, indexRange(all), input.allY, Math.floor(all / perBin));
  const N = bins.tauS.length;
  const per = all / Math.max(N, 1);
  const plain: FitLayerData = { ...layer, tauS: bins.tauS, y: bins.y, weight: 1, wander: undefined };
  const l0 = paramLayout([plain]);
  const p0: number[] = [];
  encodeLayer(plain, estimate, p0);
  // The noise (white + AR(1)) from the plain fit's residuals: their variogram at lags up to a
  // few seconds, which a slow misfit hardly reaches.
  const at = new Float64Array(N);
  evaluateLayers(below, [plain], l0, p0, offsetSignal, at);
  const binS = N > 1 ? (bins.tauS[N - 1] - bins.tauS[0]) / (N - 1) : 1;
  const residuals = difference(bins.y, at);
  const variogram = variogramSums(residuals, Math.max(8, Math.round(NOISE_LAGS_S / binS)));
  const candidates: WanderPrep['candidates'] = [];
  const prep = {
    N, per, rateNmPerS: estimate.rateNmPerS, durationS: layer.durationS, freeGain: plain.heldGain === null, gainPriorSigma: input.gainPriorSigma,
    residuals, variogram, candidates,
  };
  // (too few bins: the choice keeps the plain law)
  if (N < 100) return prep;
  for (const correlationS of WANDER_CORRELATIONS_S) {
    const wander: RateWander = rateWander({ knotsS: wanderKnots(layer.durationS, correlationS), sigmaNmPerS: 1, correlationS, pointSigma: 1 });
    const withW: FitLayerData = { ...plain, wander };
    const layout = paramLayout([withW]);
    const p: number[] = [];
    encodeLayer(withW, estimate, p);
    const np0 = layout.count;
    // The stack below's errors as random effects of known covariance, in the whitened data's
    // units (columns Js·Ls, Σs = Ls·Lsᵀ, unit-normal weights): both candidates carry them, so
    // the wander is kept only for a bend of the fringes that they do not explain.
    const stackCols = input.stack ? stackBelowColumns(below, withW, layout, p, offsetSignal, at, input.stack) : [];
    const growthCol = input.growthFromHere ? lastBelowThicknessColumn(below, withW, layout, p, offsetSignal, at) : null;
    // A gain held at the chip's (refit) is known only to its calibration: free in both, as a
    // per-layer fit has it (∂y/∂g = (y − offset)/g).
    const gainCol = plain.heldGain !== null && plain.heldGain !== 0 ? overGain(at, offsetSignal, plain.heldGain) : null;
    const m = stackCols.length;
    const np = np0 + m + (growthCol ? 1 : 0) + (gainCol ? 1 : 0);
    const steps = Float64Array.from(p, (v) => 1e-6 * Math.max(Math.abs(v), 1e-3));
    const jac = new Float64Array(np * N);
    jacobianLayers(below, [withW], layout, Float64Array.from(p), offsetSignal, at, steps, jac.subarray(0, np0 * N));
    stackCols.forEach((c, q) => jac.set(c, (np0 + q) * N));
    if (growthCol) jac.set(growthCol, (np0 + m) * N);
    if (gainCol) jac.set(gainCol, (np - 1) * N);
    const wFirst = (withW.heldIndex === null ? 1 : 0) + 1 + (withW.fitDrift ? 1 : 0), k = wander.knotsS.length;
    candidates.push({ correlationS, jac, np, np0, m, wFirst, k });
  }
  return prep;
}

// Plain loops for the per-sample arrays: a typed array's from() with a map function calls it per
// element and cost more than the variance algebra on 100 Hz traces (the bench's 40-layer run).
function indexRange(n: number): Int32Array {
  const out = new Int32Array(n);
  for (let i = 0; i < n; i++) out[i] = i;
  return out;
}

function difference(y: ArrayLike<number>, at: ArrayLike<number>): Float64Array {
  const out = new Float64Array(y.length);
  for (let i = 0; i < out.length; i++) out[i] = y[i] - at[i];
  return out;
}

/** (v − offset)/gain for each value. */
function overGain(v: ArrayLike<number>, offset: number, gain: number): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < out.length; i++) out[i] = (v[i] - offset) / gain;
  return out;
}
