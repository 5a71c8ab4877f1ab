import { fitLayers, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { paramLayout, type FitLayerData } from './layerModel';
import { layerChangesFor, type LayerChange } from './solutionShift';
import { addHeldIndexSigma, heldIndexShift } from './thinLayer';

/**
 * A sequentially fitted layer's σ with the chip's gain drift γ uncertain (σ_γ, the prior of
 * fit/gainDriftPrior.ts): the sequential fit holds γ within the layer (and, for a held gain, in
 * the gain at the layer's start, G·(1 + γ·t)), so the layer is fitted again with γ one σ higher,
 * started from its estimates, and the change of each figure is added in quadrature
 * (first-order propagation, as for the offset in fit/offsetSigma.ts). `refit` fits `fit` as it
 * stands (analyzeRun's fitSingle, whose gain prior is centred on the start gain); `anchorAt(γ)`
 * is the chip's gain at the layer's start under a drift γ: the held gain, or where a free gain's
 * prior sits.
 * Updates the estimate's σ in place.
 */
export function carryGainDriftSigma(
  fit: FitLayerData, estimate: LayerEstimate, driftPerS: number, sigmaPerS: number,
  anchorAt: (driftPerS: number) => number,
  refit: (index: number, rateNmPerS: number, gain: number) => JointFitResult,
): void {
  if (!(sigmaPerS > 0)) return;
  const saved = { drift: fit.gainDriftPerS, held: fit.heldGain };
  const moved = driftPerS + sigmaPerS;
  fit.gainDriftPerS = moved;
  if (fit.heldGain !== null) fit.heldGain = anchorAt(moved);
  try {
    const m = refit(estimate.index, estimate.rateNmPerS, fit.heldGain ?? estimate.gain + anchorAt(moved) - anchorAt(driftPerS)).layers[0];
    addHeldIndexSigma(estimate, 1, heldIndexShift(estimate, m, 1));
    estimate.rateSigma = Math.hypot(estimate.rateSigma, m.rateNmPerS - estimate.rateNmPerS);
  } finally {
    fit.gainDriftPerS = saved.drift;
    fit.heldGain = saved.held;
  }
}

/**
 * After a chip's final joint fit with the gain drift held (at γ), its σ into every layer of the
 * chip: the joint fit again with γ one σ higher in every layer's gain (chip-wide G·(1 + γ·t), or
 * each free per-layer gain's slope within its layer), and each figure's change added in
 * quadrature (first-order propagation, as fit/offsetSigma.ts does for the offset). The chip-wide
 * gain G is refitted with the layers, as in the fit itself.
 *
 * With `joint`, the chip's final joint fit on `data` (not robust), the moved solution is one
 * Gauss–Newton step from it (driftShift), the refit's solution to first order in σ_γ; without
 * it, the joint fit is repeated with γ moved, started from the estimates.
 */
export function carryJointGainDriftSigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], offset: number, sigmaPerS: number,
  sharedGain: SharedGain | null, robust: boolean, joint?: JointFitResult,
): void {
  if (!(sigmaPerS > 0) || estimates.length === 0) return;
  const step = !robust && joint ? driftShift(data, joint, offset, sigmaPerS, sharedGain) : null;
  if (step) {
    estimates.forEach((e, j) => {
      const d = step[j];
      addHeldIndexSigma(e, 1, { index: d.index, thicknessNm: d.thicknessNm, opticalNm: d.opticalThicknessNm });
      e.rateSigma = Math.hypot(e.rateSigma, d.rateNmPerS);
    });
    return;
  }
  const moved = data.map((d) => ({ ...d, gainDriftPerS: (d.gainDriftPerS ?? 0) + sigmaPerS }));
  const shifted = fitLayers(
    { fixedBelow: [], layers: moved, start: estimates, offsetSignal: offset, ...(sharedGain ? { sharedGain: { ...sharedGain, fitDrift: false } } : {}) },
    { robust, maxIterations: 30 },
  );
  estimates.forEach((e, j) => {
    const m = shifted.layers[j];
    addHeldIndexSigma(e, 1, heldIndexShift(e, m, 1));
    e.rateSigma = Math.hypot(e.rateSigma, m.rateNmPerS - e.rateNmPerS);
  });
}

/**
 * The joint fit's solution with the held drift γ raised by Δγ, linearised. Each sample's model is
 * w·(g·(1 + γ·t)·M + o) (fit/layerModel.ts: t from the chip's reference under a chip-wide gain,
 * from the layer's start under a per-layer one), so it rises by (model − w·o)·Δγ·t/(1 + γ·t),
 * and the model is the data less the residual. The solution moves by Δθ = (JᵀJ)⁻¹Jᵀ·(−Δmodel)
 * (LeastSquaresResult.shiftFor), as in fit/offsetSigma.ts. Null when the step cannot be taken
 * (a fitted drift, a singular normal matrix, a layout that does not match).
 */
function driftShift(
  data: readonly FitLayerData[], joint: JointFitResult, offset: number, deltaPerS: number,
  sharedGain: SharedGain | null,
): LayerChange[] | null {
  const { solver } = joint;
  if (sharedGain?.fitDrift) return null;
  const layout = paramLayout(data, sharedGain !== null, false);
  const dy = new Float64Array(solver.residuals.length);
  let pos = 0;
  for (const l of data) {
    const w = l.weight ?? 1, gamma = l.gainDriftPerS ?? 0, t0 = sharedGain ? l.chipTimeS : 0;
    for (let i = 0; i < l.y.length; i++) {
      const t = t0 + l.tauS[i];
      const scaled = w * (l.y[i] - offset) - solver.residuals[pos + i];
      dy[pos + i] = -scaled * deltaPerS * t / (1 + gamma * t);
    }
    pos += l.y.length;
  }
  return layerChangesFor(data, solver, layout, dy);
}
