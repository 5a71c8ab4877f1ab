import { type JointFitResult, type LayerEstimate } from './fitLayers';

export interface IndexSeparation {
  /** Hold the index: the data do not tell it apart from the thickness. */
  hold: boolean;
  /** The index σ of the free trial fit (NaN when the normal matrix was singular). */
  indexSigma: number;
  /** Correlation of index and end thickness in the trial fit. */
  correlation: number;
  /** Why, in words for the layer's note. */
  reason: string;
}

/**
 * Whether a thin layer's index can be fitted, judged from a free trial fit of that layer alone:
 * held when index and end thickness correlate beyond `maxCorrelation` in the trial fit (the
 * data then see only their product, the optical thickness; common practice: a parameter pair
 * with |ρ| → 1 is not separately determined), when the index σ exceeds `maxIndexSigma`, or when
 * the normal matrix is singular. The trial's σ is that of one layer on the stack as estimated so
 * far, so the correlation, which does not depend on the noise level, decides first.
 */
export function indexSeparation(trial: JointFitResult, maxIndexSigma: number, maxCorrelation: number): IndexSeparation {
  const e = trial.layers[0];
  const cov = trial.solver.covariance;
  const np = trial.solver.params.length;
  // Trial layout [n, r, …]: cov(n, d) = T·cov(n, r), T from d = r·T.
  const T = e.rateNmPerS !== 0 ? e.thicknessNm / e.rateNmPerS : 0;
  const correlation = e.indexSigma > 0 && e.thicknessSigmaNm > 0 ? (T * cov[1]) / (e.indexSigma * e.thicknessSigmaNm) : NaN;
  const sigma = trial.solver.wellDetermined ? e.indexSigma : NaN;
  const hold = !(sigma <= maxIndexSigma) || !(Math.abs(correlation) <= maxCorrelation) || np < 2;
  const rho = Number.isFinite(correlation) ? correlation.toFixed(3) : 'undefined';
  const reason = Number.isFinite(sigma)
    ? `a free fit of this layer finds index and thickness correlated at ${rho} (held beyond ±${maxCorrelation}) and the index only to ±${sigma.toFixed(4)} (held above ±${maxIndexSigma})`
    : 'a free fit of this layer cannot determine the index (singular normal matrix)';
  return { hold, indexSigma: sigma, correlation, reason };
}

/**
 * A held index's own uncertainty σh carried into the layer's figures: the data fix the optical
 * thickness n·d, so an index off by δn moves the thickness by −(d/n)·δn. Returns the extra
 * covariance of (n, d) and updates the estimate's index and thickness σ in place (the optical
 * thickness σ stays).
 */
export function applyHeldIndexSigma(e: LayerEstimate, sigmaHeld: number): [number, number, number, number] {
  const k = -e.thicknessNm / e.index;
  const v = sigmaHeld * sigmaHeld;
  e.indexSigma = sigmaHeld;
  e.thicknessSigmaNm = Math.sqrt(e.thicknessSigmaNm ** 2 + k * k * v);
  return [v, k * v, k * v, k * k * v];
}
