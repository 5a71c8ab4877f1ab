import { monitorCurve, type Design } from '../design';
import { type Segment, type TraceData } from '../trace';

/** Where a layer's start and end may lie: the samples from the pause before it to the pause after it. */
export interface BoundaryWindow {
  from: number;
  to: number;
}

export interface PlaceBoundaryOptions {
  /** Most samples per cost evaluation. @default 600 */
  maxPoints?: number;
  /** Passes after the first with the windows clipped at the neighbours' boundaries. @default 2 */
  passes?: number;
  /** Fit an offset as well as the gain (stray light; levels off the design's by more than a gain) where the layer swings the signal by ≥ 10 %. @default true */
  affine?: boolean;
  /** Thickness range searched, as a fraction of the design thickness (±). @default 0.2 */
  thicknessRange?: number;
}

/**
 * Places each inferred layer's start and end on the model: over the window from the pause before
 * to the pause after, the samples are fitted by flat (the level the layer starts from), growth
 * at a constant rate to thickness D, flat (the level it was cut at), with the layer's design
 * monitor curve on the chip's design stack and a gain solved in closed form; start, end and D
 * are searched in turn (coordinate descent, four rounds). A turning-point cut and the flat pause
 * after it look alike sample by sample; the whole fringe's phase tells where the turning point
 * lies, so the end is placed where the model's turning point and the flat meet rather than
 * where the signal first looks flat.
 */
export function placeBoundaries(
  trace: TraceData, design: Design, layers: readonly Segment[], windows: readonly BoundaryWindow[], options: PlaceBoundaryOptions = {},
): Segment[] {
  let placed = placeOnce(trace, design, layers, windows, options);
  // Further passes: each window ends where the neighbours now start and end, so the next layer's
  // own slow start (or the last one's slow end) no longer pulls a boundary towards it.
  for (let pass = 0; pass < (options.passes ?? 2); pass++) {
    const prev = placed;
    const clipped = windows.map((w, j) => ({
      from: Math.max(w.from, j > 0 ? prev[j - 1].endIndex : w.from),
      to: Math.min(w.to, j + 1 < prev.length ? prev[j + 1].startIndex : w.to),
    }));
    placed = placeOnce(trace, design, prev, clipped, options);
  }
  return placed;
}

function placeOnce(
  trace: TraceData, design: Design, layers: readonly Segment[], windows: readonly BoundaryWindow[], options: PlaceBoundaryOptions,
): Segment[] {
  const t = trace.timeS, y = trace.signal;
  const maxPoints = options.maxPoints ?? 600;
  const range = options.thicknessRange ?? 0.2;
  const affine = options.affine ?? true;
  const out: Segment[] = [];
  layers.forEach((seg, j) => {
    const dl = design.layers[seg.layer - 1];
    const w = windows[j];
    // a layer starts after the one before it ends
    const floor = out.length ? out[out.length - 1].endIndex : 0;
    if (!dl || !w || seg.endIndex - seg.startIndex < 20) {
      out.push({ ...seg });
      return;
    }
    // the monitor curve tabulated once; a cost evaluation interpolates it
    const top = dl.thicknessNm * (1 + range) * 1.05;
    const steps = 2000;
    const grid = new Float64Array(steps + 1);
    for (let i = 0; i <= steps; i++) grid[i] = (top * i) / steps;
    const table = monitorCurve(design, dl.layer, grid, { pol: 's' });
    // an offset is told apart from the gain only where the layer swings the signal well (≥ 10 %: a threshold chosen here, not from a source)
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i <= steps / (1 + range) / 1.05; i++) [lo, hi] = [Math.min(lo, table[i]), Math.max(hi, table[i])];
    const withOffset = affine && hi - lo >= 0.1 * hi;
    const stride = Math.max(1, Math.ceil((w.to - w.from) / maxPoints));
    // bin means, not picked samples: every sample's information at a fraction of the points
    const nb = Math.ceil((w.to - w.from) / stride);
    const bt = new Float64Array(nb), by = new Float64Array(nb);
    for (let b = 0; b < nb; b++) {
      const a = w.from + b * stride, z = Math.min(a + stride, w.to);
      for (let i = a; i < z; i++) {
        bt[b] += t[i] / (z - a);
        by[b] += y[i] / (z - a);
      }
    }
    const cost = (ts: number, te: number, D: number): number => {
      let sym = 0, smm = 0, syy = 0, sm = 0, sy = 0;
      const span = Math.max(te - ts, 1e-9);
      for (let i = 0; i < nb; i++) {
        const u = Math.min(Math.max((bt[i] - ts) / span, 0), 1);
        const x = (D * u * steps) / top;
        const k = Math.min(Math.floor(x), steps - 1);
        const m = table[k] + (x - k) * (table[k + 1] - table[k]);
        sym += by[i] * m;
        smm += m * m;
        syy += by[i] * by[i];
        sm += m;
        sy += by[i];
      }
      if (!withOffset) return syy - (sym * sym) / smm;
      // y ≈ g·m + c: least squares, residual Σy² − (g·Σym + c·Σy)
      const N = nb, det = smm * N - sm * sm;
      if (!(det > 1e-12 * smm * N)) return syy - (sym * sym) / smm;
      const g = (sym * N - sm * sy) / det, c = (smm * sy - sm * sym) / det;
      return syy - g * sym - c * sy;
    };
    let s = seg.startIndex, e = seg.endIndex - 1, D = dl.thicknessNm;
    const dur = Math.max(e - s, 20);
    const sLo = Math.max(w.from, floor), sHi = Math.min(e - 10, s + Math.round(0.15 * dur));
    const eLo = Math.max(s + 10, e - Math.round(0.15 * dur)), eHi = w.to - 1;
    for (let round = 0; round < 4; round++) {
      s = scan(sLo, Math.min(sHi, e - 10), (i) => cost(t[i], t[e], D));
      e = scan(Math.max(eLo, s + 10), eHi, (i) => cost(t[s], t[i], D));
      const dBest = scan(0, 400, (k) => cost(t[s], t[e], dl.thicknessNm * (1 - range + (2 * range * k) / 400)));
      D = dl.thicknessNm * (1 - range + (2 * range * dBest) / 400);
    }
    out.push({ ...seg, startIndex: s, endIndex: e + 1, startTimeS: t[s], endTimeS: t[e], sampleCount: e + 1 - s });
  });
  return out;
}

/** The integer in [from, to] with the lowest cost: a coarse pass, then every one near the best. */
function scan(from: number, to: number, f: (i: number) => number): number {
  if (to <= from) return from;
  const step = Math.max(1, Math.floor((to - from) / 80));
  let best = from, bestCost = Infinity;
  for (let i = from; i <= to; i += step) {
    const c = f(i);
    if (c < bestCost) [best, bestCost] = [i, c];
  }
  for (let i = Math.max(from, best - step); i <= Math.min(to, best + step); i++) {
    const c = f(i);
    if (c < bestCost) [best, bestCost] = [i, c];
  }
  return best;
}
