import { type LayerAt } from '../optics';
import { autocorrelationTime } from '../stats';
import { leastSquares, type LeastSquaresOptions, type LeastSquaresResult } from './leastSquares';
import { type ColumnTails } from './solver';
import {
  decodeLayer, encodeLayer, evaluateLayers, jacobianLayers, paramLayout,
  type FitLayerData, type LayerParams, type ParamLayout,
} from './layerModel';
import { lawThickness, wanderBasis, wanderCount } from './rateWander';
import { driftPriorWeight, guessNoise, weightFromFit, type DriftPrior } from './gainDriftPrior';

/** The fitted index stays within ±15 % of the material's nominal. */
export const INDEX_BOUND = 0.15;
/** A fitted index gradient (Δn through the layer) stays within ±10 % of the nominal index. */
export const GRADIENT_BOUND = 0.1;

export interface JointFitInput {
  /** Layers on the chip below the first fitted one, held, at the fitted layers' wavelength. */
  fixedBelow: readonly LayerAt[];
  layers: readonly FitLayerData[];
  /** Starting values, one per layer. */
  start: readonly LayerParams[];
  offsetSignal: number;
  /**
   * A Gaussian prior on each free per-layer gain, centred on its start value: σ as a fraction of
   * the gain, with the data's noise σ to weigh it against the samples (a pseudo-observation).
   */
  gainPrior?: { fraction: number; noiseSigma: number };
  /**
   * Fit one gain for all the layers, G·(1 + γ·t) with t from the chip's reference (start values);
   * with fitDrift and driftPrior, γ under a Gaussian prior (fit/gainDriftPrior.ts).
   */
  sharedGain?: SharedGain;
}

/** A chip-wide gain G·(1 + γ·t): start values, whether γ is fitted, and γ's prior if any. */
export interface SharedGain {
  gain: number;
  driftPerS: number;
  fitDrift: boolean;
  driftPrior?: DriftPrior;
  /**
   * A Gaussian prior on G from an independent reading (the bare chip's): a pseudo-observation
   * (G − mean)·c, c = noiseSigma/sigma, noiseSigma the fit points' σ as the covariance counts it
   * (with the correlation time: √τ·s, fit/gainDriftPrior.ts driftPriorWeight).
   */
  gainPrior?: { mean: number; sigma: number; noiseSigma: number };
}

/** One layer's estimates with 1σ (σ of a held parameter is 0). */
export interface LayerEstimate extends LayerParams {
  indexSigma: number;
  rateSigma: number;
  rateDriftSigma: number;
  gainSigma: number;
  /** d at the layer's last sample. */
  thicknessNm: number;
  thicknessSigmaNm: number;
  /** n·d at the monitor wavelength. */
  opticalThicknessNm: number;
  opticalThicknessSigmaNm: number;
  /** Integrated autocorrelation time of the layer's residuals, in fit points (1 for white noise); the σ include √ of it. */
  noiseCorrelation: number;
  /** σ of a fitted index gradient Δn (0 when held or absent). */
  indexGradientSigma?: number;
  /**
   * The index's change with the detector's offset one σ higher (fit/offsetSigma.ts; its square is
   * in indexSigma): a shift every layer's reading shares, one draw per run, which the pooling
   * (fit/pooledIndex.ts) carries as such rather than as each layer's own error.
   */
  indexOffsetShift?: number;
  /**
   * The fit's own variances of d and n and their covariance (nm², nm), before any σ carried from
   * outside the fit (stack below, offset, gain drift): what moves d's end against the layer's own
   * turning point (fit/cutPastTurningPoint.ts relativeCut).
   */
  ownCovariance?: { dd: number; nn: number; dn: number };
}

export interface JointFitResult {
  layers: LayerEstimate[];
  /** The chip-wide gain G and its drift γ (per second), when fitted; priorWeight: the weight of γ's prior row, when it had one. */
  sharedGain: { gain: number; gainSigma: number; driftPerS: number; driftSigmaPerS: number; priorWeight?: number } | null;
  solver: LeastSquaresResult;
}

/**
 * Least-squares fit of consecutive layers of one chip against the growing-layer model, each
 * layer on the ones before it as currently estimated. One layer: the sequential fit; all
 * layers of a chip: the joint re-fit.
 */
export function fitLayers(input: JointFitInput, options: LeastSquaresOptions = {}): JointFitResult {
  const prior = input.sharedGain?.fitDrift ? input.sharedGain.driftPrior : undefined;
  if (!prior) return fitOnce(input, options);
  // γ's prior row weighs against the residuals of this very fit (fit/gainDriftPrior.ts): weigh it
  // from the data's own noise, then once more from the fit's residuals if that moved it by over 2 %.
  const guess = prior.weight ?? driftPriorWeight(prior, guessNoise(input.layers), 1);
  const first = fitOnce(withPriorWeight(input, guess), options);
  const weight = weightFromFit(first, input.layers, prior);
  if (!(Math.abs(weight / guess - 1) > 0.02)) return first;
  const g = first.sharedGain!;
  return fitOnce(
    { ...withPriorWeight(input, weight), start: first.layers, sharedGain: { ...input.sharedGain!, gain: g.gain, driftPerS: g.driftPerS, driftPrior: { ...prior, weight } } },
    options,
  );
}

function withPriorWeight(input: JointFitInput, weight: number): JointFitInput {
  return { ...input, sharedGain: { ...input.sharedGain!, driftPrior: { ...input.sharedGain!.driftPrior!, weight } } };
}

function fitOnce(input: JointFitInput, options: LeastSquaresOptions): JointFitResult {
  const { fixedBelow, layers, start, offsetSignal, sharedGain, gainPrior } = input;
  const shared = sharedGain !== undefined;
  const layout = paramLayout(layers, shared, sharedGain?.fitDrift ?? false);
  const p0: number[] = [], scale: number[] = [], min: number[] = [], max: number[] = [];
  layers.forEach((layer, j) => {
    const s = start[j];
    encodeLayer(layer, s, p0, shared);
    const T = Math.max(layer.durationS, 1e-9);
    const r = Math.abs(s.rateNmPerS);
    // The wander's parameters have a unit-normal prior: typical change 0.3, bounds ±8.
    const wk = wanderCount(layer.wander);
    const w = (v: number) => (wk > 0 ? new Float64Array(wk).fill(v) : undefined);
    encodeLayer(layer, { index: 0.01, rateNmPerS: 0.005 * r, rateDriftNmPerS2: (0.01 * r) / T, gain: 0.001 * Math.abs(s.gain), wander: w(0.3), indexGradient: 0.01 }, scale, shared);
    const nominal = layer.nominalAt(layer.optics.wavelengthNm).re;
    const dnMax = GRADIENT_BOUND * nominal;
    encodeLayer(layer, { index: Math.max(1, (1 - INDEX_BOUND) * nominal), rateNmPerS: 0.2 * r, rateDriftNmPerS2: -r / T, gain: 0.5 * s.gain, wander: w(-8), indexGradient: -dnMax }, min, shared);
    encodeLayer(layer, { index: (1 + INDEX_BOUND) * nominal, rateNmPerS: 5 * r, rateDriftNmPerS2: r / T, gain: 2 * s.gain, wander: w(8), indexGradient: dnMax }, max, shared);
  });
  if (sharedGain) {
    p0.push(sharedGain.gain);
    scale.push(0.001 * Math.abs(sharedGain.gain));
    min.push(0.5 * sharedGain.gain);
    max.push(2 * sharedGain.gain);
    if (sharedGain.fitDrift) {
      p0.push(sharedGain.driftPerS);
      scale.push(1e-7);
      min.push(-1e-3);
      max.push(1e-3);
    }
  }
  let total = 0;
  for (const l of layers) total += l.y.length;
  // Gain priors: one pseudo-observation per free per-layer gain, (g − g₀)·σ_noise/σ_prior.
  const priors: { param: number; g0: number; c: number }[] = [];
  if (gainPrior && !shared && gainPrior.noiseSigma > 0) {
    layers.forEach((l, j) => {
      if (l.heldGain !== null) return;
      const next = j + 1 < layers.length ? layout.offsets[j + 1] : layout.count;
      priors.push({ param: next - 1, g0: start[j].gain, c: gainPrior.noiseSigma / (gainPrior.fraction * Math.abs(start[j].gain)) });
    });
  }
  // The gain drift's prior: a pseudo-observation (γ − γ₀)·c (fit/gainDriftPrior.ts).
  const driftPrior = sharedGain?.fitDrift ? sharedGain.driftPrior : undefined;
  if (driftPrior?.weight !== undefined && layout.sharedDrift >= 0) priors.push({ param: layout.sharedDrift, g0: driftPrior.meanPerS, c: driftPrior.weight });
  const gp = sharedGain?.gainPrior;
  if (gp && gp.sigma > 0 && gp.noiseSigma > 0) priors.push({ param: layout.shared, g0: gp.mean, c: gp.noiseSigma / gp.sigma });
  // The wander's unit-normal prior: 0 = σ_point·v_j (scaled by the layer's weight, like its data).
  layers.forEach((l, j) => {
    const k = wanderCount(l.wander);
    const first = layout.offsets[j] + (l.heldIndex === null ? 1 : 0) + 1 + (l.fitDrift ? 1 : 0);
    for (let i = 0; i < k; i++) priors.push({ param: first + i, g0: 0, c: (l.weight ?? 1) * l.wander!.pointSigma });
  });
  const y = new Float64Array(total + priors.length);
  let pos = 0;
  for (const l of layers) {
    const w = l.weight ?? 1;
    for (let i = 0; i < l.y.length; i++) y[pos + i] = w * l.y[i];
    pos += l.y.length;
  }
  const width = total + priors.length;
  // Block structure: a layer's parameters touch its own samples and the later layers' (and a
  // prior's row at the end); a per-layer gain without a prior only its own samples.
  const rowStart = new Int32Array(layout.count), rowEnd = new Int32Array(layout.count).fill(width);
  pos = 0;
  layers.forEach((l, j) => {
    const next = j + 1 < layers.length ? layout.offsets[j + 1] : shared ? layout.shared : layout.count;
    for (let k = layout.offsets[j]; k < next; k++) rowStart[k] = pos;
    if (!shared && l.heldGain === null && !priors.some((q) => q.param === next - 1)) rowEnd[next - 1] = pos + l.y.length;
    pos += l.y.length;
  });
  // With free wander knots (many growth-law columns), their products over the later layers' rows
  // from each layer's rate column (solver/normalEquations.ts ColumnTails).
  const tails = layers.some((l) => wanderCount(l.wander) > 0) ? growthLawTails(layers, layout, total) : null;
  const solver = leastSquares(
    {
      y,
      model: (p, out) => {
        evaluateLayers(fixedBelow, layers, layout, p, offsetSignal, out.subarray(0, total));
        priors.forEach((q, k) => (out[total + k] = (p[q.param] - q.g0) * q.c));
      },
      jacobian: (p, at, steps, out) => {
        if (priors.length === 0) return jacobianLayers(fixedBelow, layers, layout, p, offsetSignal, at, steps, out);
        // the layers' columns written straight into rows of the full width (zeroed whole there),
        // not into an array of their own copied over: the same values, two passes fewer over it
        jacobianLayers(fixedBelow, layers, layout, p, offsetSignal, at.subarray(0, total), steps, out, width);
        priors.forEach((q, k) => (out[q.param * width + total + k] = q.c));
      },
      start: p0,
      scale,
      min,
      max,
      columnRows: { start: rowStart, end: rowEnd },
      ...(tails ? { columnTails: tails } : {}),
    },
    options,
  );
  const np = layout.count;
  const tau = inflateForCorrelatedNoise(solver, layers, layout, shared);
  const cov = (a: number, b: number) => (a < 0 || b < 0 ? 0 : solver.covariance[a * np + b]);
  const estimates = layers.map((layer, j) => {
    const v = decodeLayer(layer, solver.params, layout.offsets[j], layout);
    let i = layout.offsets[j];
    const iN = layer.heldIndex === null ? i++ : -1;
    const iR = i++;
    const iA = layer.fitDrift ? i++ : -1;
    const wk = wanderCount(layer.wander);
    const iW = i;
    i += wk;
    const iDn = layer.indexGradient === 'fit' ? i++ : -1;
    const iG = !shared && layer.heldGain === null ? i : -1;
    const T = layer.durationS;
    // d = r·T + a·T²/2 + Σ v_j·Ψ_j(T) and n·d; first-order propagation through the covariance
    const grad: [number, number][] = [[iR, T], [iA, 0.5 * T * T]];
    if (wk > 0) wanderBasis(layer.wander!, T, new Float64Array(wk)).forEach((g, j) => grad.push([iW + j, g]));
    const d = lawThickness(v, layer.wander, T);
    let varD = 0, covDN = 0;
    for (const [a, ga] of grad) {
      covDN += ga * cov(a, iN);
      for (const [b, gb] of grad) varD += ga * gb * cov(a, b);
    }
    const varND = v.index * v.index * varD + d * d * cov(iN, iN) + 2 * v.index * d * covDN;
    const sd = (k: number) => (k < 0 ? 0 : Math.sqrt(Math.max(0, cov(k, k))));
    let gainSigma = sd(iG);
    if (shared) {
      const t = layer.chipTimeS, G = solver.params[layout.shared], kd = layout.sharedDrift;
      const gamma = kd < 0 ? 0 : solver.params[kd];
      const a = 1 + gamma * t, b = G * t, k = layout.shared;
      gainSigma = Math.sqrt(Math.max(0, a * a * cov(k, k) + b * b * cov(kd, kd) + 2 * a * b * cov(k, kd)));
    }
    return {
      ...v,
      indexSigma: sd(iN),
      rateSigma: sd(iR),
      rateDriftSigma: sd(iA),
      gainSigma,
      thicknessNm: d,
      thicknessSigmaNm: Math.sqrt(Math.max(0, varD)),
      opticalThicknessNm: v.index * d,
      opticalThicknessSigmaNm: Math.sqrt(Math.max(0, varND)),
      noiseCorrelation: tau[j],
      ownCovariance: { dd: Math.max(0, varD), nn: Math.max(0, cov(iN, iN)), dn: covDN },
      ...(iDn >= 0 ? { indexGradientSigma: sd(iDn) } : {}),
    };
  });
  const k = layout.shared;
  const sharedResult = shared
    ? {
        gain: solver.params[k], gainSigma: solver.sigma[k],
        driftPerS: layout.sharedDrift < 0 ? 0 : solver.params[layout.sharedDrift],
        driftSigmaPerS: layout.sharedDrift < 0 ? 0 : solver.sigma[layout.sharedDrift],
        ...(driftPrior?.weight !== undefined && layout.sharedDrift >= 0 ? { priorWeight: driftPrior.weight } : {}),
      }
    : null;
  return { layers: estimates, sharedGain: sharedResult, solver };
}

/**
 * Scales the covariance for correlated noise: each layer's residuals give its autocorrelation
 * time τ (stats/correlatedNoise), and cov(a, b) grows by √(τ_a·τ_b), τ of a parameter being its
 * layer's (of a chip-wide one, the sample-weighted mean). Returns τ per layer.
 */
function inflateForCorrelatedNoise(solver: LeastSquaresResult, layers: readonly FitLayerData[], layout: ReturnType<typeof paramLayout>, shared: boolean): number[] {
  const tau: number[] = [];
  let pos = 0, pooled = 0;
  for (const l of layers) {
    const t = Math.max(1, autocorrelationTime(solver.residuals, pos, pos + l.y.length));
    tau.push(t);
    pooled += t * l.y.length;
    pos += l.y.length;
  }
  pooled /= Math.max(pos, 1);
  const np = layout.count;
  const f = new Float64Array(np).fill(Math.sqrt(pooled));
  layers.forEach((_, j) => {
    const next = j + 1 < layers.length ? layout.offsets[j + 1] : shared ? layout.shared : np;
    for (let k = layout.offsets[j]; k < next; k++) f[k] = Math.sqrt(tau[j]);
  });
  for (let a = 0; a < np; a++) {
    for (let b = 0; b < np; b++) solver.covariance[a * np + b] *= f[a] * f[b];
    solver.sigma[a] *= f[a];
  }
  return tau;
}

/** Each layer's growth-law columns (rate, drift, wander knots) as multiples of its rate column on the later layers' rows. */
function growthLawTails(layers: readonly FitLayerData[], layout: ParamLayout, total: number): ColumnTails {
  const from = new Int32Array(layout.count), base = new Int32Array(layout.count).fill(-1);
  let pos = 0;
  layers.forEach((l, j) => {
    pos += l.tauS.length;
    const rate = layout.offsets[j] + (l.heldIndex === null ? 1 : 0);
    for (let k = rate; k < rate + 1 + (l.fitDrift ? 1 : 0) + wanderCount(l.wander); k++) {
      from[k] = pos;
      base[k] = rate;
    }
  });
  return { from, to: total, base };
}
