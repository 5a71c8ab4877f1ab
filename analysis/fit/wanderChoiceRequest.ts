import { newVariogramPool, type VariogramPool } from '../stats';
import { indexAt, type MaterialModel } from '../materials';
import { type Complex } from '../optics';
import { type FitLayerData } from './layerModel';
import { chooseRateWander, type WanderChoice, type WanderChoiceInput } from './wanderChoice';

/**
 * One layer's wander choice (fit/wanderChoice.ts) as plain data, so another thread can make it
 * (AnalyzeOptions.wanderChoices) while this one fits the next layers, where the choice is read
 * only once the pass is over (refit, the wander not fitted). The layer's fit data less its nominal
 * index function (rebuilt from the material's model); the run's variogram pool stays with whoever
 * makes the choices, which take the layers in order.
 */
export interface WanderChoiceRequest extends Omit<WanderChoiceInput, 'layer' | 'noisePool'> {
  layer: Omit<FitLayerData, 'nominalAt'>;
  material: MaterialModel;
}

/** The request for a layer's choice (without the pool, which the chooser holds). */
export function wanderChoiceRequest(input: Omit<WanderChoiceInput, 'noisePool'>, material: MaterialModel): WanderChoiceRequest {
  const { nominalAt: _n, ...layer } = input.layer;
  return { ...input, layer, material };
}

/**
 * Makes the choices of one pass in the order asked, with one variogram pool, as chooseRateWander
 * does on this thread: the same functions on the same values, so the same figures.
 */
export function wanderChooser(): (r: WanderChoiceRequest) => WanderChoice {
  const pool: VariogramPool = newVariogramPool();
  return (r) => {
    const memo = new Map<number, Complex>();
    const nominalAt = (w: number) => {
      let v = memo.get(w);
      if (!v) memo.set(w, (v = indexAt(r.material, w)));
      return v;
    };
    const { material: _m, layer, ...input } = r;
    return chooseRateWander({ ...input, layer: { ...layer, nominalAt }, noisePool: pool });
  };
}
