import { type LayerAt } from '../optics';
import { evaluateLayers, jacobianLayers, type FitLayerData, type ParamLayout } from './layerModel';

/**
 * One layer's model on its stack below at `params`, and its transposed Jacobian (np × n, forward
 * differences with relative steps of 1e-6): what the first-order propagations of the stack's
 * σ (stackUncertainty) and of the growth after a cut (growthFromNext) start from.
 */
export function layerJacobian(below: readonly LayerAt[], layer: FitLayerData, layout: ParamLayout, params: Float64Array, offsetSignal: number): { at: Float64Array; jt: Float64Array } {
  const np = layout.count;
  const n = layer.tauS.length;
  const at = new Float64Array(n);
  evaluateLayers(below, [layer], layout, params, offsetSignal, at);
  const steps = new Float64Array(np);
  for (let j = 0; j < np; j++) steps[j] = 1e-6 * Math.max(Math.abs(params[j]), 1e-6);
  const jt = new Float64Array(np * n);
  jacobianLayers(below, [layer], layout, params, offsetSignal, at, steps, jt);
  return { at, jt };
}
