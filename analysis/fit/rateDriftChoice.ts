import { fitLayers, type JointFitInput, type JointFitResult, type LayerEstimate } from './fitLayers';
import { type LeastSquaresOptions } from './leastSquares';
import { type FitLayerData } from './layerModel';

/**
 * Whether a layer's rate drift a (d = r·τ + a·τ²/2) is carried by its own data: by Schwarz's
 * criterion for the one parameter, the drift is kept where it lowers χ² by more than ln N (N the
 * layer's fit points; G. Schwarz, "Estimating the dimension of a model", Ann. Statist. 6(2),
 * 461–464 (1978)), χ²'s fall taken as (a/σ_a)² (Wald's form).
 */
export function driftCarried(estimate: LayerEstimate, fitPoints: number): boolean {
  const sigma = estimate.rateDriftSigma;
  if (!(sigma > 0)) return true;
  const z = estimate.rateDriftNmPerS2 / sigma;
  return z * z > Math.log(Math.max(fitPoints, 2));
}

/** One layer's rate drift as the relative change of its rate over the layer, g = a·T/r, and its σ. */
export interface RelativeDrift {
  g: number;
  sigma: number;
}

/**
 * Whether the layers' drifts scatter more than their σ say: Cochran's Q (the precision-weighted
 * sum of squares about the weighted mean; W. G. Cochran, "The combination of estimates from
 * different experiments", Biometrics 10, 101–129 (1954)) beyond the 95 % point of χ² with k − 1
 * degrees of freedom. A rate that wanders within each layer, or ramps, shows as drifts that
 * differ from layer to layer by more than their noise. False for fewer than two drifts.
 */
export function driftsScatter(drifts: readonly RelativeDrift[]): boolean {
  const k = drifts.length;
  if (k < 2) return false;
  const w = drifts.map((d) => 1 / (d.sigma * d.sigma));
  const sw = w.reduce((a, b) => a + b, 0);
  const mean = drifts.reduce((a, d, i) => a + w[i] * d.g, 0) / sw;
  const q = drifts.reduce((a, d, i) => a + w[i] * (d.g - mean) ** 2, 0);
  return q > chiSquare95(k - 1);
}

/**
 * The 95 % point of χ² with ν degrees of freedom, by Wilson and Hilferty's cube-root
 * approximation (E. B. Wilson, M. M. Hilferty, "The distribution of chi-square", Proc. Natl.
 * Acad. Sci. 17, 684–688 (1931)): within 3 % at ν = 1, closer above.
 */
export function chiSquare95(nu: number): number {
  const c = 2 / (9 * nu);
  return nu * (1 - c + 1.6448536 * Math.sqrt(c)) ** 3;
}

/**
 * The residuals' integrated autocorrelation time (fit points) below which a layer's residuals
 * count as white: its model follows the data down to the detector's noise.
 */
export const WHITE_RESIDUALS = 1.5;

/** A joint fit with the drifts the data do not carry held at 0, and which layers those are. */
export interface DriftChoice {
  /** The layers' data as fitted: fitDrift false where the drift was held. */
  layers: FitLayerData[];
  result: JointFitResult;
  /** Positions (in `layers`) of the layers whose drift was held. */
  held: number[];
}

/**
 * A chip's joint fit `free` (every drift of `input` that is fitted, free) again with each rate
 * drift held at 0 where its layer's data do not carry it (driftCarried), provided nothing on
 * the chip says the rate moves: the chip's drifts (relative, a·T/r, free, without a wander) do
 * not scatter beyond their σ (driftsScatter), and every such layer's residuals are white
 * (noiseCorrelation under WHITE_RESIDUALS). A drift the data cannot tell from 0 moves the end of
 * a layer whose end is extrapolated from its slope (a cut on or near a turning point) by its own
 * noise; but under correlated residuals a drift within its σ cannot be told from a rate that
 * wanders (on the sample four-layer AR and the chamber simulator's BBAR with the rate wandering
 * 1–1.5 %, holding the last layer's drift at 1.75σ and 0.38σ took it from 0.27 to 0.65 % and
 * from 0.59 to 0.76 % off).
 *
 * The held fit's estimates carry the free fit's σ: the drift held at 0 is uncertain by what the
 * data allow it, σ_a of the free fit, and carrying that into the held fit (its change of every
 * figure per unit a, times σ_a, in quadrature with the held fit's own σ) gives back, to first
 * order, the free fit's covariance (the conditional variance plus the regression on a). So
 * holding moves the estimates, not their σ. Unchanged (held empty) when every drift stays free.
 */
export function holdUncarriedDrifts(input: JointFitInput, free: JointFitResult, options: LeastSquaresOptions = {}): DriftChoice {
  const unchanged = { layers: input.layers.slice(), result: free, held: [] };
  const fitted = input.layers.flatMap((l, j) => (l.fitDrift && !l.wander ? [j] : []));
  if (fitted.some((j) => !(free.layers[j].noiseCorrelation < WHITE_RESIDUALS))) return unchanged;
  const drifts = fitted.map((j): RelativeDrift => {
    const e = free.layers[j], scale = input.layers[j].durationS / e.rateNmPerS;
    return { g: e.rateDriftNmPerS2 * scale, sigma: e.rateDriftSigma * scale };
  });
  if (!drifts.every((d) => Number.isFinite(d.g) && d.sigma > 0 && Number.isFinite(d.sigma)) || driftsScatter(drifts)) return unchanged;
  const held = fitted.filter((j) => !driftCarried(free.layers[j], input.layers[j].tauS.length));
  if (held.length === 0) return unchanged;
  const layers = input.layers.map((l, j) => (held.includes(j) ? { ...l, fitDrift: false } : l));
  const start = free.layers.map((e, j) => (held.includes(j) ? { ...e, rateDriftNmPerS2: 0 } : e));
  const sharedGain = free.sharedGain && input.sharedGain ? { sharedGain: { ...input.sharedGain, gain: free.sharedGain.gain, driftPerS: free.sharedGain.driftPerS } } : {};
  const refit = fitLayers({ ...input, layers, start, ...sharedGain }, options);
  return { layers, result: { ...refit, layers: refit.layers.map((e, j) => withSigmaOf(e, free.layers[j])) }, held };
}

/** `e`'s estimates with `of`'s σ. */
function withSigmaOf(e: LayerEstimate, of: LayerEstimate): LayerEstimate {
  return {
    ...e,
    indexSigma: of.indexSigma, rateSigma: of.rateSigma, rateDriftSigma: of.rateDriftSigma, gainSigma: of.gainSigma,
    thicknessSigmaNm: of.thicknessSigmaNm, opticalThicknessSigmaNm: of.opticalThicknessSigmaNm,
  };
}
