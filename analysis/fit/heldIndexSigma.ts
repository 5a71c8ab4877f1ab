import { NOMINAL_INDEX_SIGMA } from '../stats';
import { type LayerState } from './analyzeRun';
import { fitLayers, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { type FitLayerData } from './layerModel';
import { addHeldIndexSigma, heldIndexShift, type HeldIndexShift } from './thinLayer';

/**
 * A sequentially fitted layer with a held index: how its estimates move with that index, from the
 * fit repeated with the index one σ higher (`refit(index, rate, gain)` fits `fit` as it is).
 */
export function shiftWithHeldIndex(
  fit: FitLayerData, held: number, sigma: number, base: LayerEstimate,
  refit: (index: number, rateNmPerS: number, gain: number) => JointFitResult,
): HeldIndexShift {
  const step = sigma > 0 ? sigma : NOMINAL_INDEX_SIGMA;
  fit.heldIndex = held + step;
  try {
    return heldIndexShift(base, refit(held + step, base.rateNmPerS, fit.heldGain ?? base.gain).layers[0], step);
  } finally {
    fit.heldIndex = held;
  }
}

/**
 * After a chip's final joint fit, each held index's σ into every layer of the chip: the joint fit
 * took the held index as exact, and the layers fitted with it move when it moves (the layer
 * itself most, the ones above it through the stack). One joint fit per held index, with that
 * index one σ higher, started from the estimates; the held indices are taken as independent.
 */
export function heldIndexSigmaIntoChip(
  data: readonly FitLayerData[], states: readonly LayerState[],
  chipGain: SharedGain | null, robust: boolean,
): void {
  const base = states.map((s) => ({ ...s.estimate }));
  states.forEach((s, h) => {
    const held = s.fit.heldIndex;
    if (held === null) return;
    const sigma = s.heldIndexSigma ?? NOMINAL_INDEX_SIGMA;
    const moved = data.map((d, j) => (j === h ? { ...d, heldIndex: held + sigma } : d));
    const joint = fitLayers(
      { fixedBelow: [], layers: moved, start: base, offsetSignal: states[0].calibration.offset, ...(chipGain ? { sharedGain: { ...chipGain } } : {}) },
      { robust },
    );
    states.forEach((t, j) => addHeldIndexSigma(t.estimate, sigma, heldIndexShift(base[j], joint.layers[j], sigma)));
  });
}
