import { type JointFitResult, type LayerEstimate } from './fitLayers';
import { type FitLayerData } from './layerModel';
import { addHeldIndexSigma, heldIndexShift } from './thinLayer';

/**
 * A held gain's σ (as a fraction of the gain) carried into the layers fitted with it: the fit is
 * repeated with every held gain one σ higher, started from the estimates, and each figure's change
 * added in quadrature (first-order propagation, as fit/offsetSigma.ts does for the offset).
 * `refit` fits the moved layers (one layer in sequential, the chip's final joint fit in refit).
 * Updates the estimates' σ in place.
 */
export function carryHeldGainSigma(
  layers: readonly FitLayerData[], estimates: LayerEstimate[], sigmaFraction: number,
  refit: (moved: FitLayerData[]) => JointFitResult,
): void {
  if (!(sigmaFraction > 0) || estimates.length === 0) return;
  const moved = layers.map((l) => (l.heldGain === null ? l : { ...l, heldGain: l.heldGain * (1 + sigmaFraction) }));
  const shifted = refit(moved).layers;
  estimates.forEach((e, j) => {
    const m = shifted[j];
    addHeldIndexSigma(e, 1, heldIndexShift(e, m, 1));
    e.rateSigma = Math.hypot(e.rateSigma, m.rateNmPerS - e.rateNmPerS);
  });
}
