import { findTurningPoints, type TurningPoint } from '../trace';
import { subsampleUniform } from './subsample';

/** The turning points a layer's readings show, with what layerResult reads beside them. */
export interface ObservedTurningPoints {
  /** Indices into the subsample the search ran on. */
  points: TurningPoint[];
  /** The subsample's time at each point's index, s. */
  sampleTimeS: number[];
  /** The subsample's first time step, s (0 with one sample). */
  stepS: number;
}

/**
 * The turning points a layer's readings show (hysteresis search), for comparison with the
 * model's: at most 5000 samples, uniform in τ, keep this cheap on long layers. timeS and y are
 * the layer's own series, or, with `indices`, the trace's (the layer's samples at indices). A
 * function of the samples alone, so the analyze command computes it on its second thread.
 */
export function observedTurningPoints(tauS: Float64Array, timeS: ArrayLike<number>, y: ArrayLike<number>, indices?: Int32Array): ObservedTurningPoints {
  const sub = subsampleUniform(tauS, 0, tauS.length, 5000);
  const subTime = gather(timeS, sub, indices);
  const points = findTurningPoints(subTime, gather(y, sub, indices), { smoothWindow: sub.length >= 21 ? 21 : 0, includeEnd: true });
  return { points, sampleTimeS: points.map((t) => subTime[t.index]), stepS: subTime.length > 1 ? subTime[1] - subTime[0] : 0 };
}

/** values[indices[sub[i]]] (values[sub[i]] without indices) for each i. */
function gather(values: ArrayLike<number>, sub: Int32Array, indices?: Int32Array): Float64Array {
  const out = new Float64Array(sub.length);
  if (indices) for (let i = 0; i < sub.length; i++) out[i] = values[indices[sub[i]]];
  else for (let i = 0; i < sub.length; i++) out[i] = values[sub[i]];
  return out;
}
