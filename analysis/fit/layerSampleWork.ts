import { observedTurningPoints, type ObservedTurningPoints } from './observedTurningPoints';
import { binMeans } from './subsample';

/** What analyzeRun asks of a layer's samples beside its spectrum, when another thread computes them. */
export interface SampleWork {
  /** The samples' times, s (for the turning points they show); none asked for without them. */
  timeS?: Float64Array;
  /** The bin counts the fits will ask binMeans for. */
  binPoints: number[];
  /** false: no spectrum (the layer's is not read: the profiling pass, under 3 QWOT). @default true */
  spectrum?: boolean;
}

export interface SampleWorkResult {
  observed?: ObservedTurningPoints;
  /** binMeans of the samples for each distinct size of SampleWork.binPoints. */
  binned: { points: number; tauS: Float64Array; y: Float64Array }[];
}

/**
 * The work on a layer's samples that needs no fit (its turning points, its bin means), from its
 * own series: the same functions on the same values as analyzeRun's loop, so the same figures.
 */
export function layerSampleWork(tauS: Float64Array, y: Float64Array, work: SampleWork): SampleWorkResult {
  const own = indexRange(y.length);
  // Each size once: the pass's sizes often repeat (a profiling pass asks for 100 points three times).
  const binned = [...new Set(work.binPoints)].map((points) => ({ points, ...binMeans(tauS, own, y, points) }));
  return work.timeS ? { observed: observedTurningPoints(tauS, work.timeS, y), binned } : { binned };
}

/** 0, 1, …, n − 1 (in a function of its own: compiled on the stack inline, the caller's code then left it at the next statement on every call). */
export function indexRange(n: number): Int32Array {
  const out = new Int32Array(n);
  for (let i = 0; i < n; i++) out[i] = i;
  return out;
}
