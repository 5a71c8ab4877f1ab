import { type Design } from '../design';
import { indexAt } from '../materials';
import { growingLayerSignal, type LayerAt } from '../optics';
import { type Segment, type TraceData } from '../trace';

export interface RefineOptions {
  /** How far a boundary may move, s. @default 60 */
  searchS?: number;
  /** Most samples used per candidate. @default 400 */
  maxPoints?: number;
}

/**
 * Layer segments found from the signal, made to fit the design: extra segments are merged
 * across their shortest gaps (a flat stretch at a turning point looks idle), then each start
 * and end is moved to where a constant-rate growing-layer model (design stack, nominal index,
 * gain solved in closed form) fits the samples around it best. A layer that starts at a
 * turning point grows quadratically at first, so slope-based boundaries fall late.
 */
export function refineInferredSegments(
  trace: TraceData, design: Design, segments: readonly Segment[], options: RefineOptions = {},
): { layers: Segment[]; warnings: string[] } {
  const searchS = options.searchS ?? 60;
  const maxPoints = options.maxPoints ?? 400;
  const warnings: string[] = [];
  const segs = segments.map((s) => ({ ...s }));
  while (segs.length > design.layers.length && segs.length > 1) {
    let best = 0;
    for (let i = 1; i < segs.length - 1; i++) if (segs[i + 1].startTimeS - segs[i].endTimeS < segs[best + 1].startTimeS - segs[best].endTimeS) best = i;
    const a = segs[best], b = segs[best + 1];
    warnings.push(`inferred segments at ${a.startTimeS.toFixed(1)} s and ${b.startTimeS.toFixed(1)} s merged into one layer (a ${(b.startTimeS - a.endTimeS).toFixed(1)} s flat stretch, e.g. at a turning point)`);
    segs.splice(best, 2, { ...a, endIndex: b.endIndex, endTimeS: b.endTimeS, sampleCount: b.endIndex - a.startIndex });
  }
  segs.forEach((s, i) => (s.layer = i + 1));
  const t = trace.timeS, y = trace.signal;
  const dt = (t[t.length - 1] - t[0]) / Math.max(t.length - 1, 1);
  const reach = Math.max(1, Math.round(searchS / dt));
  for (let j = 0; j < segs.length; j++) {
    const s = segs[j], dl = design.layers[j];
    if (!dl) break;
    const wl = dl.monitor.wavelengthNm;
    const below: LayerAt[] = design.layers
      .filter((l) => l.layer < dl.layer && l.monitor.chip === dl.monitor.chip)
      .map((l) => ({ n: indexAt(design.materials[l.material], wl), thicknessNm: l.thicknessNm }));
    const spec = {
      ambient: indexAt(design.ambient, wl), substrate: indexAt(design.substrate, wl), below, growing: indexAt(design.materials[dl.material], wl),
      wavelengthNm: wl, mode: dl.monitor.mode, backside: design.substrateBackside, pol: 's' as const,
    };
    const lo = Math.max(j > 0 ? segs[j - 1].endIndex : 0, s.startIndex - reach);
    const hi = Math.min(j + 1 < segs.length ? segs[j + 1].startIndex : t.length, s.endIndex + reach);
    // Start: samples [lo, end); flat before the candidate start, growing after.
    const start = scan(lo, Math.min(s.startIndex + reach, s.endIndex - 10), (c) => cost(spec, t, y, lo, s.endIndex, c, s.endIndex, dl.thicknessNm, maxPoints));
    const end = scan(Math.max(s.endIndex - reach, start + 10), hi, (e) => cost(spec, t, y, start, hi, start, e, dl.thicknessNm, maxPoints));
    s.startIndex = start;
    s.endIndex = end;
    s.startTimeS = t[start];
    s.endTimeS = t[end - 1];
    s.sampleCount = end - start;
  }
  return { layers: segs, warnings };
}

/** The index in [from, to) with the lowest cost: a coarse pass, then every sample near the best. */
function scan(from: number, to: number, f: (i: number) => number): number {
  if (to <= from + 1) return from;
  const step = Math.max(1, Math.floor((to - from) / 60));
  let best = from, bestCost = Infinity;
  for (let i = from; i < to; i += step) {
    const c = f(i);
    if (c < bestCost) [best, bestCost] = [i, c];
  }
  for (let i = Math.max(from, best - step); i < Math.min(to, best + step); i++) {
    const c = f(i);
    if (c < bestCost) [best, bestCost] = [i, c];
  }
  return best;
}

/** SSR of samples [lo, hi) against: flat before `start`, growth at a constant rate to `end`, flat after. */
function cost(
  spec: Parameters<typeof growingLayerSignal>[0], t: Float64Array, y: Float64Array,
  lo: number, hi: number, start: number, end: number, targetNm: number, maxPoints: number,
): number {
  const stride = Math.max(1, Math.ceil((hi - lo) / maxPoints));
  const idx: number[] = [];
  for (let i = lo; i < hi; i += stride) idx.push(i);
  const duration = Math.max(t[end - 1] - t[start], 1e-9);
  const d = new Float64Array(idx.length), m = new Float64Array(idx.length);
  let best = Infinity;
  for (let k = -6; k <= 6; k++) {
    const rate = (targetNm / duration) * (1 + k / 20);
    idx.forEach((i, q) => (d[q] = rate * Math.min(Math.max(t[i] - t[start], 0), duration)));
    growingLayerSignal(spec, d, m);
    let sym = 0, smm = 0;
    idx.forEach((i, q) => ((sym += y[i] * m[q]), (smm += m[q] * m[q])));
    const g = sym / smm;
    let ssr = 0;
    idx.forEach((i, q) => (ssr += (y[i] - g * m[q]) ** 2));
    best = Math.min(best, ssr * stride);
  }
  return best;
}
