import { fitLayers, type LayerEstimate, type SharedGain } from './fitLayers';
import { type FitLayerData } from './layerModel';

/**
 * The offset's own σ, into each layer's figures after a chip's final joint fit (the fit took
 * the offset as exact): the joint fit again with the offset moved by σ_o, started from its
 * estimates, and the change of every index, thickness, optical thickness and rate added in
 * quadrature (first-order propagation; σ² += (∂θ/∂o · σ_o)², the linearised change being
 * ∂θ/∂o · σ_o). σ_o is the offset's random part (a dark reading's noise, a fit's profile and
 * bare reading): the systematic allowance of a fitted offset for a wandering rate is left out,
 * since the layers' own σ already grow with the residuals a wandering rate leaves. In
 * transmittance an offset error of 0.05 % of full scale moves an index deep in the stack by a
 * few thousandths, more than the layer's own σ.
 * The held gain or the chip-wide gain is refitted with the layers, as in the fit itself.
 */
export function carryOffsetSigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], offset: number, offsetSigma: number,
  sharedGain: SharedGain | null, robust: boolean,
): void {
  if (!(offsetSigma > 0) || estimates.length === 0) return;
  const moved = fitLayers(
    { fixedBelow: [], layers: data, start: estimates, offsetSignal: offset + offsetSigma, ...(sharedGain ? { sharedGain: { ...sharedGain } } : {}) },
    { robust, maxIterations: 30 },
  );
  estimates.forEach((e, j) => {
    const m = moved.layers[j];
    const add = (sigma: number, delta: number) => Math.sqrt(sigma * sigma + delta * delta);
    e.indexSigma = add(e.indexSigma, m.index - e.index);
    e.thicknessSigmaNm = add(e.thicknessSigmaNm, m.thicknessNm - e.thicknessNm);
    e.opticalThicknessSigmaNm = add(e.opticalThicknessSigmaNm, m.opticalThicknessNm - e.opticalThicknessNm);
    e.rateSigma = add(e.rateSigma, m.rateNmPerS - e.rateNmPerS);
  });
}
