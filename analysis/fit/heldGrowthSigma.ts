import { type LayerState } from './analyzeRun';
import { fitLayers, type SharedGain } from './fitLayers';
import { type FitLayerData } from './layerModel';
import { addHeldIndexSigma, heldIndexShift } from './thinLayer';

/**
 * After a chip's final joint fit (refit), each growth after a cut that the fit held (LayerEnds
 * heldGrowths) into the σ of the chip's other layers, and into its own layer's index: the layers
 * above stand on the held layer's final thickness and the joint fit moves them, and the held
 * layer's index with them, to meet it. Measured on the chamber simulator (the lamp-reference
 * BBAR, refit, seeds 37–52): a growth of 0.1 nm after the 0.22-QWOT first layer's cut, held at 0
 * with σ 0.25 nm, moved the 0.41-QWOT second layer's index by +0.004, where that layer's σ was
 * 0.003. `stepsS`: for each layer, the time its growth's σ adds to its time base, s (null where
 * none is held). One joint fit with the layers as they stand and one per held growth, its time
 * base longer by that step; the growths taken as independent. With `ownThickness` the held
 * layer's own thickness takes its move too (a level cut's end placed without a layer column,
 * whose spread is in no σ yet: analyzeRun).
 */
export function heldGrowthSigmaIntoChip(
  data: readonly FitLayerData[], states: readonly LayerState[], stepsS: readonly (number | null)[],
  chipGain: SharedGain | null, robust: boolean, ownThickness = false,
): void {
  if (!stepsS.some((h) => h)) return;
  const ended = data.map((d, j) => ({ ...d, durationS: states[j].fit.durationS }));
  const start = states.map((s) => ({ ...s.estimate }));
  const fit = (layers: FitLayerData[]) => fitLayers(
    { fixedBelow: [], layers, start, offsetSignal: states[0].calibration.offset, ...(chipGain ? { sharedGain: { ...chipGain } } : {}) },
    { robust },
  ).layers;
  // the shifts against a fit of the same data, not against the estimates (which later steps moved)
  const base = fit(ended);
  stepsS.forEach((step, g) => {
    if (!step) return;
    const moved = fit(ended.map((d, j) => (j === g ? { ...d, durationS: d.durationS + step } : d)));
    states.forEach((t, j) => {
      const shift = heldIndexShift(base[j], moved[j], 1);
      // its own thickness σ holds the growth already (LayerEnds), unless `ownThickness`
      addHeldIndexSigma(t.estimate, 1, j === g && !ownThickness ? { index: shift.index, thicknessNm: 0, opticalNm: 0 } : shift);
    });
  });
}
