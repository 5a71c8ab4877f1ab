import { fitLayers, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { paramLayout, type FitLayerData } from './layerModel';
import { layerChangesFor, type LayerChange } from './solutionShift';
import { type StackCovariance } from './stackUncertainty';
import { addHeldIndexSigma, heldIndexShift, type HeldIndexShift } from './thinLayer';

/**
 * A sequentially fitted layer's σ with the chip's gain drift γ uncertain (σ_γ, the prior of
 * fit/gainDriftPrior.ts): the sequential fit holds γ within the layer (and, for a held gain, in
 * the gain at the layer's start, G·(1 + γ·t)), so the layer is fitted again with γ one σ higher,
 * started from its estimates, and the change of each figure is added in quadrature
 * (first-order propagation, as for the offset in fit/offsetSigma.ts). `refit` fits `fit` as it
 * stands (analyzeRun's fitSingle, whose gain prior is centred on the start gain); `anchorAt(γ)`
 * is the chip's gain at the layer's start under a drift γ: the held gain, or where a free gain's
 * prior sits.
 * Updates the estimate's σ in place and returns the shift per σ_γ (null without a σ).
 */
export function carryGainDriftSigma(
  fit: FitLayerData, estimate: LayerEstimate, driftPerS: number, sigmaPerS: number,
  anchorAt: (driftPerS: number) => number,
  refit: (index: number, rateNmPerS: number, gain: number) => JointFitResult,
): HeldIndexShift | null {
  const moved = gainDriftShift(fit, estimate, driftPerS, sigmaPerS, anchorAt, refit);
  if (!moved) return null;
  addHeldIndexSigma(estimate, 1, moved.shift);
  estimate.rateSigma = Math.hypot(estimate.rateSigma, moved.rateNmPerS);
  return moved.shift;
}

/** The layer's figures' change (and its rate's) with γ one σ higher, as carryGainDriftSigma takes it; the estimate is left as it is. */
export function gainDriftShift(
  fit: FitLayerData, estimate: LayerEstimate, driftPerS: number, sigmaPerS: number,
  anchorAt: (driftPerS: number) => number,
  refit: (index: number, rateNmPerS: number, gain: number) => JointFitResult,
): { shift: HeldIndexShift; rateNmPerS: number } | null {
  if (!(sigmaPerS > 0)) return null;
  const saved = { drift: fit.gainDriftPerS, held: fit.heldGain };
  const moved = driftPerS + sigmaPerS;
  fit.gainDriftPerS = moved;
  if (fit.heldGain !== null) fit.heldGain = anchorAt(moved);
  try {
    const m = refit(estimate.index, estimate.rateNmPerS, fit.heldGain ?? estimate.gain + anchorAt(moved) - anchorAt(driftPerS)).layers[0];
    return { shift: heldIndexShift(estimate, m, 1), rateNmPerS: m.rateNmPerS - estimate.rateNmPerS };
  } finally {
    fit.gainDriftPerS = saved.drift;
    fit.heldGain = saved.held;
  }
}

/**
 * A layer's share of σ² from the gain drift, carried at one shift (`held`: the layer's own refit on
 * the stack held) while the layer's σ was `atFit`, put at another (`chained`), in thickness and
 * optical thickness, and in the index where `withIndex` (an index pooled since has the pool's σ).
 * Where later evidence narrowed a figure's σ (the growth after the cut read from the next layer,
 * fit/layerEnds.ts, combines precisions), the share left in it is taken in the same proportion,
 * (σ/σ_atFit)², as for the precision-weighted mean of two readings.
 */
export function swapGainDriftShare(e: LayerEstimate, shares: { held: HeldIndexShift; chained: HeldIndexShift; atFit: HeldIndexShift }, withIndex: boolean): void {
  const { held, chained, atFit } = shares;
  e.thicknessSigmaNm = swapShare(e.thicknessSigmaNm, atFit.thicknessNm, held.thicknessNm, chained.thicknessNm);
  e.opticalThicknessSigmaNm = swapShare(e.opticalThicknessSigmaNm, atFit.opticalNm, held.opticalNm, chained.opticalNm);
  if (withIndex) swapIndexGainDriftShare(e, shares);
}

/**
 * The index's part of swapGainDriftShare alone: taken before the indices are pooled, so the pool
 * and the run's index drift weigh each layer's own reading by the σ it reports.
 */
export function swapIndexGainDriftShare(e: LayerEstimate, shares: { held: HeldIndexShift; chained: HeldIndexShift; atFit: HeldIndexShift }): void {
  e.indexSigma = swapShare(e.indexSigma, shares.atFit.index, shares.held.index, shares.chained.index);
}

function swapShare(sigma: number, at: number, from: number, to: number): number {
  const kept = keptFraction(sigma, at);
  return Math.sqrt(Math.max(0, sigma * sigma - kept * from * from) + kept * to * to);
}

/** The fraction of a share of σ² left where later evidence narrowed σ from `at` to `sigma`: (σ/σ_atFit)², at most 1. */
function keptFraction(sigma: number, at: number): number {
  return at > 0 ? Math.min(1, (sigma * sigma) / (at * at)) : 1;
}

/**
 * The gain drift's one-σ change of a sequential layer's figures as its reported σ hold it: the
 * share swapped in (`chained`), narrowed as swapGainDriftShare narrows it where later evidence
 * narrowed the figure (fit/lampDriftNote.ts reads it against the reported σ).
 */
export function reportedGainDriftShift(shares: { chained: HeldIndexShift; atFit: HeldIndexShift }, e: Pick<LayerEstimate, 'indexSigma' | 'thicknessSigmaNm'>): HeldIndexShift {
  const { chained, atFit } = shares;
  return {
    index: chained.index * Math.sqrt(keptFraction(e.indexSigma, atFit.index)),
    thicknessNm: chained.thicknessNm * Math.sqrt(keptFraction(e.thicknessSigmaNm, atFit.thicknessNm)),
    opticalNm: chained.opticalNm,
  };
}

/**
 * What a layer's σ took, through the stack, from the gain drift's share of the σ of the layer below
 * it (LayerEnds.stackWithGrowth puts that layer's whole thickness σ in the stack, the share of the
 * drift in it as swapGainDriftShare reckons it): |∂θ/∂d_below|·√share for (n, d, n·d), from the
 * stack's sensitivity (fit/stackUncertainty.ts).
 */
export function driftShareThroughStack(
  stack: StackCovariance, below: { held: HeldIndexShift; atFit: HeldIndexShift }, belowSigmaNm: number, e: Pick<LayerEstimate, 'index' | 'thicknessNm'>,
): HeldIndexShift | null {
  const m = stack.size - 2;
  if (!stack.sensitivity || m < 2) return null;
  const kept = below.atFit.thicknessNm > 0 ? Math.min(1, (belowSigmaNm / below.atFit.thicknessNm) ** 2) : 1;
  const share = Math.abs(below.held.thicknessNm) * Math.sqrt(kept);
  const gn = stack.sensitivity[m - 1], gd = stack.sensitivity[2 * m - 1];
  return { index: Math.abs(gn) * share, thicknessNm: Math.abs(gd) * share, opticalNm: Math.abs(e.index * gd + e.thicknessNm * gn) * share };
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
 * it, the joint fit is repeated with γ moved, started from the estimates. Returns each layer's
 * change per σ_γ (null without a σ).
 */
export function carryJointGainDriftSigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], offset: number, sigmaPerS: number,
  sharedGain: SharedGain | null, robust: boolean, joint?: JointFitResult,
): HeldIndexShift[] | null {
  if (!(sigmaPerS > 0) || estimates.length === 0) return null;
  const step = !robust && joint ? driftShift(data, joint, offset, sigmaPerS, sharedGain) : null;
  if (step) {
    return estimates.map((e, j) => {
      const d = step[j];
      const shift = { index: d.index, thicknessNm: d.thicknessNm, opticalNm: d.opticalThicknessNm };
      addHeldIndexSigma(e, 1, shift);
      e.rateSigma = Math.hypot(e.rateSigma, d.rateNmPerS);
      return shift;
    });
  }
  const moved = data.map((d) => ({ ...d, gainDriftPerS: (d.gainDriftPerS ?? 0) + sigmaPerS }));
  const shifted = fitLayers(
    { fixedBelow: [], layers: moved, start: estimates, offsetSignal: offset, ...(sharedGain ? { sharedGain: { ...sharedGain, fitDrift: false } } : {}) },
    { robust, maxIterations: 30 },
  );
  return estimates.map((e, j) => {
    const m = shifted.layers[j];
    const shift = heldIndexShift(e, m, 1);
    addHeldIndexSigma(e, 1, shift);
    e.rateSigma = Math.hypot(e.rateSigma, m.rateNmPerS - e.rateNmPerS);
    return shift;
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
