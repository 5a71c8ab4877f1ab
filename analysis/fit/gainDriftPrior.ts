import { noiseSigma } from '../trace';
import { type FitLayerData } from './layerModel';

/**
 * The monitor's lamp (and detector) stability assumed when nothing else is told, as a fraction
 * of the gain per hour (1σ of a linear drift within a chip). A tungsten-halogen monitor lamp on a
 * stabilised supply holds its output, after its warm-up, to a few tenths of a percent per hour
 * (from memory, no source at hand); 1 %/h is a loose allowance chosen here for an ageing lamp and
 * the detector's temperature, not a published figure. Set AnalyzeOptions.lampStabilityPerHour
 * from the monitor's own record (the bare-chip readings of successive chips) where one exists.
 */
export const DEFAULT_LAMP_STABILITY_PER_HOUR = 0.01;

/** A Gaussian prior on the chip-wide gain drift γ (fraction per second). */
export interface DriftPrior {
  meanPerS: number;
  sigmaPerS: number;
  /**
   * Weight c of the pseudo-observation row (γ − mean)·c among the fit's residuals, set by the fit
   * (driftPriorWeight); a value given serves as the first guess.
   */
  weight?: number;
}

/** A normal distribution by its mean and σ. */
export interface Normal {
  mean: number;
  sigma: number;
}

/**
 * The product of two Gaussian densities of one quantity (a prior and an independent measurement),
 * normalised: precisions add and the mean is the precision-weighted mean (the one-dimensional
 * case of C. M. Bishop, Pattern Recognition and Machine Learning (2006), eqs. 2.113–2.117, and of
 * the posterior of §3.3 with one basis function equal to 1). A measurement with σ = ∞ (or NaN)
 * leaves the prior unchanged.
 */
export function combineNormals(prior: Normal, measured: Normal | null): Normal {
  if (!measured || !(measured.sigma > 0) || !Number.isFinite(measured.sigma)) return prior;
  const a = 1 / prior.sigma ** 2, b = 1 / measured.sigma ** 2;
  return { mean: (a * prior.mean + b * measured.mean) / (a + b), sigma: 1 / Math.sqrt(a + b) };
}

/**
 * Weight c of the prior row (γ − γ₀)·c in a least-squares fit whose residuals have σ = s per point
 * and whose covariance is then scaled by the noise's correlation time τ (fitLayers'
 * inflateForCorrelatedNoise): the minimised sum Σr²/s² + c²(γ − γ₀)²/s² and the covariance
 * τ·s²·(JᵀJ + c²·e eᵀ)⁻¹ hold the prior's precision at 1/σ₀² when c = √τ·s/σ₀ (a Gaussian prior as
 * one extra observation: Bishop §3.3, the posterior 3.53–3.54 being the least-squares solution of
 * the data augmented by the prior's rows; from memory).
 */
export function driftPriorWeight(prior: Pick<DriftPrior, 'sigmaPerS'>, residualSigma: number, correlationTime: number): number {
  return (Math.sqrt(Math.max(1, correlationTime)) * residualSigma) / prior.sigmaPerS;
}

/** A first guess of the fitted points' noise σ (pooled second-difference σ of each layer's points, weighted as in the fit). */
export function guessNoise(layers: readonly FitLayerData[]): number {
  let sum = 0, count = 0;
  for (const l of layers) {
    const s = noiseSigma(l.y) * (l.weight ?? 1);
    sum += s * s * l.y.length;
    count += l.y.length;
  }
  return count > 0 ? Math.sqrt(sum / count) : 0;
}

/** The prior row's weight from a fit's residuals (data rows only) and its layers' correlation times. */
export function weightFromFit(
  fit: { solver: { residuals: Float64Array; params: Float64Array }; layers: readonly { noiseCorrelation: number }[] },
  layers: readonly FitLayerData[], prior: Pick<DriftPrior, 'sigmaPerS'>,
): number {
  let total = 0, ssr = 0, tau = 0;
  layers.forEach((l, j) => {
    tau += Math.max(1, fit.layers[j].noiseCorrelation) * l.y.length;
    total += l.y.length;
  });
  for (let i = 0; i < total; i++) ssr += fit.solver.residuals[i] ** 2;
  const s = Math.sqrt(ssr / Math.max(total - fit.solver.params.length, 1));
  return driftPriorWeight(prior, s, tau / Math.max(total, 1));
}

/**
 * The prior of a chip's gain drift: the lamp's stability (mean 0, σ = stabilityPerHour/3600 per
 * second) updated by the drift seen across the chips' bare-chip calibrations when there is one
 * (gainDriftFromChips: the same lamp, read at every chip change), by combineNormals.
 */
export function gainDriftPrior(stabilityPerHour: number, fromChips: { driftPerS: number; sigmaPerS: number } | null): DriftPrior {
  const p = combineNormals({ mean: 0, sigma: stabilityPerHour / 3600 }, fromChips ? { mean: fromChips.driftPerS, sigma: fromChips.sigmaPerS } : null);
  return { meanPerS: p.mean, sigmaPerS: p.sigma };
}
