import { fitLayers, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { paramLayout, type FitLayerData } from './layerModel';
import { layerChangesFor, type LayerChange } from './solutionShift';

/**
 * The offset's own σ, into each layer's figures after a chip's final joint fit (the fit took
 * the offset as exact): the joint fit's solution with the offset moved by σ_o, and the change of
 * every index, thickness, optical thickness and rate added in quadrature (first-order
 * propagation; σ² += (∂θ/∂o · σ_o)², the linearised change being ∂θ/∂o · σ_o). σ_o is the
 * offset's random part (a dark reading's noise, a fit's profile and bare reading): the
 * systematic allowance of a fitted offset for a wandering rate is left out, since the layers' own
 * σ already grow with the residuals a wandering rate leaves. In transmittance an offset error of
 * 0.05 % of full scale moves an index deep in the stack by a few thousandths, more than the
 * layer's own σ.
 * The held gain or the chip-wide gain moves with the layers, as in the fit itself.
 *
 * `joint`, the chip's final joint fit on `data` (not robust): the moved solution is one
 * Gauss–Newton step from it (offsetShift), which is the refit's solution to first order in σ_o;
 * without it, the joint fit is repeated with the offset moved, started from `estimates`.
 * The step's change is counted from the joint fit's own solution; the refit's from `estimates`.
 */
export function carryOffsetSigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], offset: number, offsetSigma: number,
  sharedGain: SharedGain | null, robust: boolean, joint?: JointFitResult,
): void {
  if (!(offsetSigma > 0) || estimates.length === 0) return;
  const add = (sigma: number, delta: number) => Math.sqrt(sigma * sigma + delta * delta);
  const step = !robust && joint ? offsetShift(data, joint, offsetSigma, sharedGain) : null;
  const changes: readonly LayerChange[] = step ?? fitLayers(
    { fixedBelow: [], layers: data, start: estimates, offsetSignal: offset + offsetSigma, ...(sharedGain ? { sharedGain: { ...sharedGain } } : {}) },
    { robust, maxIterations: 30 },
  ).layers.map((m, j) => ({
    index: m.index - estimates[j].index, thicknessNm: m.thicknessNm - estimates[j].thicknessNm,
    opticalThicknessNm: m.opticalThicknessNm - estimates[j].opticalThicknessNm, rateNmPerS: m.rateNmPerS - estimates[j].rateNmPerS,
  }));
  estimates.forEach((e, j) => {
    const c = changes[j];
    e.indexSigma = add(e.indexSigma, c.index);
    e.indexOffsetShift = c.index;
    e.thicknessSigmaNm = add(e.thicknessSigmaNm, c.thicknessNm);
    e.opticalThicknessSigmaNm = add(e.opticalThicknessSigmaNm, c.opticalThicknessNm);
    e.rateSigma = add(e.rateSigma, c.rateNmPerS);
  });
}

/**
 * The joint fit's solution with the offset raised by σ_o, linearised: the model of every sample
 * rises by w·σ_o (w, the layer's weight in the fit), as if the data fell by as much, so the
 * solution moves by Δθ = (JᵀJ)⁻¹Jᵀ·(−w·σ_o) (LeastSquaresResult.shiftFor; the gradient is zero
 * at the solution). A refit from the solution converges to the same point but for terms of order
 * σ_o² and the residuals' curvature term that Gauss–Newton drops, as the covariance s²·(JᵀJ)⁻¹
 * does. Null when the step cannot be taken (a singular normal matrix).
 */
function offsetShift(
  data: readonly FitLayerData[], joint: JointFitResult, offsetSigma: number,
  sharedGain: { fitDrift: boolean } | null,
): LayerChange[] | null {
  const { solver } = joint;
  const layout = paramLayout(data, sharedGain !== null, sharedGain?.fitDrift ?? false);
  // the fit's rows: the samples, then its priors' pseudo-observations (which the offset leaves)
  const dy = new Float64Array(solver.residuals.length);
  let pos = 0;
  for (const l of data) {
    dy.fill(-(l.weight ?? 1) * offsetSigma, pos, pos + l.y.length);
    pos += l.y.length;
  }
  // counted from the joint fit's own solution (not from the estimates, which may already hold
  // the growth re-read after it: that move is not the offset's)
  return layerChangesFor(data, solver, layout, dy);
}
