import { type LeastSquaresResult } from './leastSquares';
import { decodeLayer, type FitLayerData, type ParamLayout } from './layerModel';
import { lawThickness } from './rateWander';

/** How much a layer's figures move. */
export interface LayerChange {
  index: number;
  thicknessNm: number;
  opticalThicknessNm: number;
  rateNmPerS: number;
}

/**
 * The change of every layer's figures when the data of a converged least-squares fit move by
 * `dy` (one row per fit row; priors' rows included), linearised: one Gauss–Newton step,
 * Δθ = (JᵀJ)⁻¹Jᵀ·dy (LeastSquaresResult.shiftFor; the gradient is zero at the solution), counted
 * from the fit's own solution. A held value moved by its σ changes the model by Δmodel, which is
 * dy = −Δmodel (fit/offsetSigma.ts, fit/gainDriftSigma.ts). Null when the step cannot be taken
 * (no normal matrix kept, a singular one, or a layout that is not the fit's).
 */
export function layerChangesFor(
  data: readonly FitLayerData[], solver: Pick<LeastSquaresResult, 'params' | 'shiftFor'>, layout: ParamLayout, dy: Float64Array,
  /** The layers' data after the move, when it changed their durations (the end thickness is read at those). */
  after: readonly FitLayerData[] = data,
): LayerChange[] | null {
  if (!solver.shiftFor || layout.count !== solver.params.length) return null;
  const dp = solver.shiftFor(dy);
  if (!dp) return null;
  const moved = Float64Array.from(solver.params, (v, k) => v + dp[k]);
  return data.map((l, j) => {
    const a = decodeLayer(l, solver.params, layout.offsets[j], layout), b = decodeLayer(l, moved, layout.offsets[j], layout);
    const da = lawThickness(a, l.wander, l.durationS), db = lawThickness(b, l.wander, after[j].durationS);
    return { index: b.index - a.index, thicknessNm: db - da, opticalThicknessNm: b.index * db - a.index * da, rateNmPerS: b.rateNmPerS - a.rateNmPerS };
  });
}
