import { indexAt, type MaterialModel } from '../materials';
import { type Complex } from '../optics';
import { fitLayerData, type FitLayerData } from './layerModel';
import { type WanderChoiceInput } from './wanderChoice';
import { prepareRateWander, type WanderPrep } from './wanderPrep';

/**
 * One layer's wander choice (fit/wanderChoice.ts) as plain data, so another thread can make its
 * pool-free part (prepareRateWander; AnalyzeOptions.wanderPrepOf) while this one fits the next
 * layers, where the choice is read only once the pass is over (refit, the wander not fitted). The
 * layer's fit data less its nominal index function (rebuilt from the material's model).
 */
export interface WanderChoiceRequest extends Omit<WanderChoiceInput, 'layer' | 'noisePool'> {
  layer: Omit<FitLayerData, 'nominalAt'>;
  material: MaterialModel;
}

/** The request for a layer's choice (without the pool, which finishRateWander reads). */
export function wanderChoiceRequest(input: Omit<WanderChoiceInput, 'noisePool'>, material: MaterialModel): WanderChoiceRequest {
  const { nominalAt: _n, ...layer } = input.layer;
  return { ...input, layer, material };
}

/** prepareRateWander of a request: the same figures wherever it runs (the same functions on the same values). */
export function wanderPrepFromRequest(r: WanderChoiceRequest): WanderPrep {
  const memo = new Map<number, Complex>();
  const nominalAt = (w: number) => {
    let v = memo.get(w);
    if (!v) memo.set(w, (v = indexAt(r.material, w)));
    return v;
  };
  const { material: _m, layer, ...input } = r;
  return prepareRateWander({ ...input, layer: fitLayerData({ ...layer, nominalAt }) });
}

/** The arrays of a prep that another thread may hand over rather than copy (it keeps none of them). */
export function wanderPrepBuffers(p: WanderPrep): ArrayBuffer[] {
  return [p.residuals.buffer as ArrayBuffer, ...p.candidates.map((c) => c.jac.buffer as ArrayBuffer)];
}
