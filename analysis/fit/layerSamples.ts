import { type Segment, type TraceData } from '../trace';

/** All samples of one design layer, with τ = deposition time since the layer's start. */
export interface LayerSamples {
  layer: number;
  chip: number;
  /** Sample indices into the trace. */
  indices: Int32Array;
  /** Deposition time since the layer's start; pauses between runs of a paused layer are removed. */
  tauS: Float64Array;
  startTimeS: number;
  endTimeS: number;
  runs: number;
  /** Set when tauS is the exposure time of a start transient of this delay (fit/startTransient.ts), s. */
  startDelayS?: number;
}

/** Gathers the segments of each layer (a paused layer has several) into one sample set. */
export function gatherLayerSamples(trace: TraceData, segments: readonly Segment[]): Map<number, LayerSamples> {
  const byLayer = new Map<number, Segment[]>();
  for (const s of segments) {
    const list = byLayer.get(s.layer) ?? [];
    list.push(s);
    byLayer.set(s.layer, list);
  }
  const out = new Map<number, LayerSamples>();
  const t = trace.timeS;
  for (const [layer, segs] of byLayer) {
    segs.sort((a, b) => a.startIndex - b.startIndex);
    let count = 0;
    for (const s of segs) count += s.endIndex - s.startIndex;
    const indices = new Int32Array(count);
    // on shared memory with the trace's columns (readTraceRows for a second thread): handed to it uncopied
    const tauS = t.buffer instanceof SharedArrayBuffer ? new Float64Array(new SharedArrayBuffer(8 * count)) : new Float64Array(count);
    let k = 0, tauEnd = 0;
    for (let si = 0; si < segs.length; si++) {
      const s = segs[si];
      // A resumed run continues one sample step after the previous run's end (a run of a
      // single sample takes the step before it, so τ stays strictly increasing).
      const step = s.endIndex - s.startIndex > 1 ? t[s.startIndex + 1] - t[s.startIndex] : t[s.startIndex] - t[s.startIndex - 1];
      const base = si === 0 ? 0 : tauEnd + step;
      k = gatherRun(t, s.startIndex, s.endIndex, base, indices, tauS, k);
      tauEnd = tauS[k - 1];
    }
    out.set(layer, {
      layer, chip: segs[0].chip, indices, tauS, startTimeS: t[segs[0].startIndex],
      endTimeS: t[segs[segs.length - 1].endIndex - 1], runs: segs.length,
    });
  }
  return out;
}

/**
 * One run's samples from k on: their indices, and τ from `base`; returns the next k. A function of
 * its own, so that V8 compiles this loop alone while it runs (on-stack replacement), not all of
 * gatherLayerSamples, which runs once: that compile took long enough for most of the trace's
 * samples to pass through the interpreter meanwhile.
 */
function gatherRun(t: Float64Array, start: number, end: number, base: number, indices: Int32Array, tauS: Float64Array, k: number): number {
  const t0 = t[start];
  for (let i = start; i < end; i++) {
    indices[k] = i;
    tauS[k] = base + (t[i] - t0);
    k++;
  }
  return k;
}
