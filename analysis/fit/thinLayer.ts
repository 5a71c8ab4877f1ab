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
 * with |ρ| → 1 is not separately determined), when the index σ exceeds `maxIndexSigma` (the caller
 * passes what the run's other layers of the material already tell, so a held value is the better
 * estimate), or when the normal matrix is singular. The trial's σ is that of one layer on the stack as estimated so
 * far, so the correlation, which does not depend on the noise level, decides first.
 */
export function indexSeparation(trial: JointFitResult, maxIndexSigma: number, maxCorrelation: number): IndexSeparation {
  const e = trial.layers[0];
  const cov = trial.solver.covariance;
  const np = trial.solver.params.length;
  // cov(n, d) as the fit propagated it (d = r·T + a·T²/2 + the wander's terms: a layer of ≥ 0.5 QWOT
  // fits a rate drift a too); else, trial layout [n, r, …], cov(n, d) = T·cov(n, r), T from d = r·T.
  const T = e.rateNmPerS !== 0 ? e.thicknessNm / e.rateNmPerS : 0;
  const covND = e.ownCovariance ? e.ownCovariance.dn : T * cov[1];
  const correlation = e.indexSigma > 0 && e.thicknessSigmaNm > 0 ? covND / (e.indexSigma * e.thicknessSigmaNm) : NaN;
  const sigma = trial.solver.wellDetermined ? e.indexSigma : NaN;
  const hold = !(sigma <= maxIndexSigma) || !(Math.abs(correlation) <= maxCorrelation) || np < 2;
  const rho = Number.isFinite(correlation) ? correlation.toFixed(3) : 'undefined';
  const reason = Number.isFinite(sigma)
    ? `a free fit of this layer finds index and thickness correlated at ${rho} (held beyond ±${maxCorrelation}) and the index only to ±${sigma.toFixed(4)} (held above ±${maxIndexSigma})`
    : 'a free fit of this layer cannot determine the index (singular normal matrix)';
  return { hold, indexSigma: sigma, correlation, reason };
}

/** How a layer's estimates move per unit change of a held index (its own or one below it). */
export interface HeldIndexShift {
  index: number;
  thicknessNm: number;
  opticalNm: number;
}

/**
 * The shift of a layer's estimates per unit of a held index, by a secant over one σ of that index:
 * the fit repeated with the index moved by `step`. Not n·d held constant: for a layer well under a
 * quarter-wave the signal's swing depends on the index itself (the Fresnel coefficients), so the
 * data fix neither d nor n·d alone (in a 0.22-QWOT Ta2O5 layer, n·d moves by about 1.1 % per 0.01
 * of index).
 */
export function heldIndexShift(base: LayerEstimate, moved: LayerEstimate, step: number): HeldIndexShift {
  return {
    index: (moved.index - base.index) / step,
    thicknessNm: (moved.thicknessNm - base.thicknessNm) / step,
    opticalNm: (moved.opticalThicknessNm - base.opticalThicknessNm) / step,
  };
}

/**
 * A held index's σh carried into a layer's figures (the held layer's own, shift.index = 1, or a
 * layer fitted with it): to first order each estimate moves by shift·δn, so σ² gains (shift·σh)².
 * Updates the estimate's σ in place and returns the extra covariance of (n, d), row-major.
 */
export function addHeldIndexSigma(e: LayerEstimate, sigmaHeld: number, shift: HeldIndexShift): [number, number, number, number] {
  const v = sigmaHeld * sigmaHeld;
  e.indexSigma = Math.sqrt(e.indexSigma ** 2 + shift.index ** 2 * v);
  e.thicknessSigmaNm = Math.sqrt(e.thicknessSigmaNm ** 2 + shift.thicknessNm ** 2 * v);
  e.opticalThicknessSigmaNm = Math.sqrt(e.opticalThicknessSigmaNm ** 2 + shift.opticalNm ** 2 * v);
  const nd = shift.index * shift.thicknessNm * v;
  return [shift.index ** 2 * v, nd, nd, shift.thicknessNm ** 2 * v];
}
