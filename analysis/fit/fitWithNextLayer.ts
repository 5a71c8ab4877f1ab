import { type LayerAt } from '../optics';
import { type LayerState } from './analyzeRun';
import { fitLayers, type JointFitInput, type LayerEstimate } from './fitLayers';
import { layerAtWavelength } from './layerModel';
import { holdUncarriedDrifts } from './rateDriftChoice';

/** What a sequential layer brings to a joint fit with the next ones: its gain start (held, anchored or its own) and the pass's gain prior. */
export interface PairPart {
  startGain: (e: LayerEstimate) => number;
  gainPrior?: { fraction: number; noiseSigma: number };
}

/** Layers in each joint fit: the level-cut layer and the two above it on its chip. */
export const NEXT_LAYER_WINDOW = 3;

/** A turning-point cut no window covers, on the stack below as it now stands: its own fit again where that moved (option fitOnFinalStack), else left. */
export type OwnFitAgain = (s: LayerState, below: LayerAt[]) => void;

/**
 * Sequential mode, once the pass is over (option fitWithNextLayer): each layer cut on level
 * fitted again jointly with the next two on its chip (NEXT_LAYER_WINDOW; fewer at the chip's end),
 * bottom up, on the stack below as it then stands; every layer of the window keeps the joint
 * fit's estimates, and the next window starts from them, so a chip's last layers end with the
 * window under them. Held thin layers cut on level take their index from the whole run first
 * (the caller's). A level cut's own samples tell its index and thickness along one curve only
 * (its end level gives the stack's transmittance, not the admittance the next layer grows on,
 * and just past a turning point the level tells the thickness little); the next layers, which
 * grow on that admittance, pin the rest. The joint fit holds each rate drift its layer's data do
 * not carry (fit/rateDriftChoice.ts, as refit's final joint fit). Turning-point cuts are left to
 * their own fits (their ends are read from the next layer's start already, fit/growthFromNext.ts):
 * one that no window covers goes to `ownFitAgain` on the stack as it now stands. σ stay those of
 * the pass (the stack's, the growth's, the gain's and the held index's carried into them, wider
 * than the window's own).
 */
export function fitWithNextLayers(chipLayers: ReadonlyMap<number, LayerState[]>, robust: boolean, ownFitAgain: OwnFitAgain): void {
  for (const chipStates of chipLayers.values()) {
    let coveredTo = -1;
    chipStates.forEach((s, j) => {
      const wl = s.optics.wavelengthNm;
      const belowOf = () => chipStates.slice(0, j).map((p) => layerAtWavelength(p.fit, p.estimate, wl));
      const window = chipStates.slice(j, j + NEXT_LAYER_WINDOW);
      if (s.design.monitor.cut !== 'level' || window.some((p) => !p.pairPart)) {
        if (j > coveredTo) ownFitAgain(s, belowOf());
        return;
      }
      // A wandering rate's knots held at their estimate (as refitChip's fits during the pass).
      const layers = window.map((p) => (p.fit.wander && p.estimate.wander ? { ...p.fit, wander: { ...p.fit.wander, fixed: p.estimate.wander } } : p.fit));
      const { gainPrior } = s.pairPart!;
      const input: JointFitInput = {
        fixedBelow: belowOf(), layers, offsetSignal: s.calibration.offset,
        start: window.map((p) => ({ ...p.estimate, gain: p.pairPart!.startGain(p.estimate) })), ...(gainPrior ? { gainPrior } : {}),
      };
      const { result } = holdUncarriedDrifts(input, fitLayers(input, { robust }), { robust });
      window.forEach((p, k) => {
        const { index, rateNmPerS, rateDriftNmPerS2, gain, wander, indexGradient, thicknessNm, opticalThicknessNm } = result.layers[k];
        p.estimate = { ...p.estimate, index, rateNmPerS, rateDriftNmPerS2, gain, thicknessNm, opticalThicknessNm, ...(wander ? { wander } : {}), ...(indexGradient !== undefined ? { indexGradient } : {}) };
      });
      coveredTo = j + window.length - 1;
    });
  }
}
