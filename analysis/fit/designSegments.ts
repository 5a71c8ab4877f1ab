import { type Design } from '../design';
import { flatStretches, type FlatStretch, type Segment, type TraceData } from '../trace';
import { expectedLevels, SHAPE_POINTS } from './expectedLevels';
import { type BoundaryWindow } from './placeBoundaries';

export interface DesignSegmentOptions {
  /** Level mismatch that costs one unit, as a fraction of the detector's full scale. @default 0.02 */
  levelTolerance?: number;
  /** Flat stretches closer than this may together make one pause (e.g. fragments around a turning-point cut), s. @default 20 */
  spanGapS?: number;
  /** Cost of a flat stretch inside a layer beyond the layer's expected inner turning points. @default 6 */
  extraFlatCost?: number;
  /** Cost of a design layer left without a segment. @default 40 */
  skipCost?: number;
  /** Weight of the layer's shape mismatch (nine points inside it, each costed as a level). @default 1/3 */
  shapeWeight?: number;
}

export interface DesignSegmentation {
  /** One segment per design layer found, numbered by design layer, in time order. */
  layers: Segment[];
  idle: Segment[];
  warnings: string[];
  /** Design layers the trace shows no segment for. */
  missing: number[];
  /** Per layer segment: from the start of the pause before it to the end of the pause after it (fit/placeBoundaries searches there). */
  windows: BoundaryWindow[];
  /** The detector gain the levels matched at (reading of a fraction 1.0; NaN with no segments). */
  gain: number;
}

/** A candidate pause; `unseen` where no flat stretch was found (a level cut's short pause under the noise). */
type Cand = FlatStretch & { unseen?: boolean };

/** A pause between layers: one flat stretch, or several close ones read together. */
interface Pause { first: number; last: number; extra: number }

const CAP = 9;

/**
 * Segments a trace without a layer column from the design. Candidate pauses are the trace's flat
 * stretches (trace/flatStretches); the design says how many layers there are and what the monitor
 * shows at each layer's start and end and at its inner turning points (fit/expectedLevels). A
 * dynamic programme picks, for layers 1…L in order, the pause before and after each so that the
 * levels at the pauses match the design (one unknown detector gain, re-estimated once from the
 * match), flat stretches inside a layer are explained by its turning points, the reading between
 * the pauses follows the layer's design curve at a steady rate, and the chip column
 * (when there is one) agrees with the design's chip. A flat stretch at an extreme right after a
 * turning-point cut is thereby a pause when the levels say so, and a layer's own slow stretch near
 * an inner turning point is not. A layer the trace does not show can be skipped at a cost; it is
 * returned in `missing` (the caller fails the run naming it). A level cut's pause may be too short
 * to show as flat; the times the reading crosses the cut level are then candidates too, at a cost.
 * The costs (one unit per 2 % of full scale of level mismatch, capped at 9; 6 per unexplained flat
 * stretch; 40 per skipped layer; one unit for a rate 2.5× off the run's mean; a third of a level's
 * cost at each of nine points of the layer's shape) are chosen here, not
 * taken from a source. The boundaries are coarse (the
 * edges of flat stretches); fit/placeBoundaries places them on the model.
 */
export function segmentByDesign(trace: TraceData, design: Design, options: DesignSegmentOptions = {}): DesignSegmentation {
  const n = trace.rowCount;
  const t = trace.timeS, y = trace.signal;
  const expected = expectedLevels(design);
  const L = expected.length;
  if (n < 20) {
    return { layers: [], idle: [], warnings: [], missing: expected.map((e) => e.layer), windows: [], gain: NaN };
  }
  const flats = flatStretches(t, y);
  // virtual zero-length pauses at both ends: a run may start or end while a layer grows
  const edge = (from: number, to: number) => median(y, Math.max(0, from), Math.min(n, to));
  const k2 = Math.max(1, Math.round(2 / Math.max((t[n - 1] - t[0]) / Math.max(n - 1, 1), 1e-9)));
  const spanGap = options.spanGapS ?? 20;
  let cands: Cand[] = [];
  let m = 0;
  let pauses: Pause[] = [];
  /** The candidate pauses: the flat stretches, and (for level cuts) zero-length ones where the reading crosses a cut level. */
  const build = (extra: Cand[]) => {
    cands = [
      { startIndex: 0, endIndex: 0, startLevel: edge(0, k2), endLevel: edge(0, k2) },
      ...[...flats.filter((f) => f.startIndex > 0 && f.endIndex < n), ...extra].sort((a, b) => a.startIndex - b.startIndex),
      { startIndex: n, endIndex: n, startLevel: edge(n - k2, n), endLevel: edge(n - k2, n) },
    ];
    // a flat stretch touching the trace's start or end replaces the virtual one there
    if (flats.length && flats[0].startIndex === 0) cands[0] = flats[0];
    if (flats.length && flats[flats.length - 1].endIndex === n) cands[cands.length - 1] = flats[flats.length - 1];
    m = cands.length;
    pauses = [];
    for (let i = 0; i < m; i++) {
      for (let j = i; j < m; j++) {
        if (j > i && t[Math.min(cands[j].startIndex, n - 1)] - t[Math.max(cands[j - 1].endIndex - 1, 0)] > spanGap) break;
        pauses.push({ first: i, last: j, extra: j - i });
      }
    }
  };
  build([]);
  const top = quantile(y, 0.99);
  const stepTol = 0.01 * top;
  // The detector gain: from the highest reading against the design's highest level, and from the
  // first flat stretch against the bare chip; each refined once from the levels it matched.
  const gains = [top / Math.max(...expected.map((e) => e.maxLevel), 1e-6)];
  if (cands.length > 2 && expected[0].startLevel > 0) gains.push(cands[cands[0].endIndex > 0 ? 0 : 1].endLevel / expected[0].startLevel);
  // the mean rate over the run, from the design's total thickness and the time the trace is not flat
  let flatS = 0;
  for (const f of flats) flatS += t[f.endIndex - 1] - t[f.startIndex];
  const meanRate = design.layers.reduce((a, l) => a + l.thicknessNm, 0) / Math.max(t[n - 1] - t[0] - flatS, 1e-9);
  // The layer's shape between its pauses: the reading at nine evenly spaced times inside a
  // candidate segment (1 s means) against the design's curve at the same fractions of the layer's
  // thickness (a steady rate), each within ±5 % of the layer (the ramp as the shutter opens, a rate
  // that wanders). Levels at the pauses alone cannot tell a level cut's pause, hidden in the noise,
  // from a flat stretch further on where the next layer starts near the same level.
  const cum = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) cum[i + 1] = cum[i] + y[i];
  const halfWin = Math.max(1, Math.round(0.5 / Math.max((t[n - 1] - t[0]) / Math.max(n - 1, 1), 1e-9)));
  const fractions = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];
  const bands = expected.map((e) => fractions.map((f) => {
    let lo = Infinity, hi = -Infinity;
    for (let i = Math.floor((f - 0.05) * SHAPE_POINTS); i <= Math.ceil((f + 0.05) * SHAPE_POINTS); i++) [lo, hi] = [Math.min(lo, e.shape[i]), Math.max(hi, e.shape[i])];
    return [lo, hi] as const;
  }));
  const shapeWeight = options.shapeWeight ?? 1 / 3;
  const shapeCost = (k: number, s: number, end: number, gain: number, tol: number): number => {
    if (!(shapeWeight > 0)) return 0;
    const t0 = t[s], span = t[end - 1] - t0;
    let sum = 0;
    for (let j = 0; j < fractions.length; j++) {
      const at = t0 + fractions[j] * span;
      // the first sample at or after `at`: from where even sampling puts it, a few steps at most
      let i = s + Math.round(fractions[j] * (end - 1 - s));
      while (i < end - 1 && t[i] < at) i++;
      while (i > s && t[i - 1] >= at) i--;
      const a = Math.max(s, i - halfWin), b = Math.min(end, i + halfWin + 1);
      const obs = (cum[b] - cum[a]) / (b - a);
      const [lo, hi] = bands[k - 1][j];
      const dist = obs < gain * lo ? gain * lo - obs : obs > gain * hi ? obs - gain * hi : 0;
      sum += Math.min((dist / tol) ** 2, CAP);
    }
    return shapeWeight * sum;
  };
  let best: ReturnType<typeof solve> | null = null;
  for (const g0 of gains) {
    if (!(g0 > 0) || !Number.isFinite(g0)) continue;
    let trial = solve(g0);
    if (trial.gainFit && Math.abs(trial.gainFit / g0 - 1) > 1e-3) {
      const second = solve(trial.gainFit);
      if (second.cost < trial.cost) trial = second;
    }
    if (!best || trial.cost < best.cost) best = trial;
  }
  if (!best) best = solve(1);
  // A level cut's pause may be too short to show as flat: where the reading crosses a level-cut
  // layer's cut level (at the gain found) is a candidate too, at a cost for the pause not seen.
  if (design.layers.some((l) => l.monitor.cut === 'level')) {
    const g = best.gain;
    build(levelCrossings(t, y, design.layers.filter((l) => l.monitor.cut === 'level').map((l) => g * expected[l.layer - 1].endLevel)));
    let trial = solve(g);
    if (trial.gainFit && Math.abs(trial.gainFit / g - 1) > 1e-3) {
      const second = solve(trial.gainFit);
      if (second.cost < trial.cost) trial = second;
    }
    best = trial;
  }

  const layers: Segment[] = [];
  const windows: BoundaryWindow[] = [];
  const missing: number[] = [];
  const misfits: string[] = [];
  for (let k = 1; k <= L; k++) {
    const bound = best.bounds[k];
    if (!bound) {
      missing.push(k);
      continue;
    }
    const [p, q] = bound;
    const startIndex = cands[pauses[p].last].endIndex, endIndex = cands[pauses[q].first].startIndex;
    layers.push({
      layer: k, chip: trace.chip ? trace.chip[startIndex] : expected[k - 1].chip, startIndex, endIndex,
      startTimeS: t[startIndex], endTimeS: t[endIndex - 1], sampleCount: endIndex - startIndex, run: 1,
    });
    // the search reaches over the neighbouring flat stretches at the layer's own start and end level (not across a chip change's steps)
    // within a pause on one chip every flat stretch may hold the boundary; across a chip change only those after the last step
    const sameChipBefore = k > 1 && expected[k - 2].chip === expected[k - 1].chip;
    const sameChipAfter = k < L && expected[k].chip === expected[k - 1].chip;
    let a = sameChipBefore ? pauses[p].first : pauses[p].last, b = sameChipAfter ? pauses[q].last : pauses[q].first;
    const near = (i: number, j: number) => t[Math.min(cands[j].startIndex, n - 1)] - t[Math.max(cands[i].endIndex - 1, 0)] <= spanGap;
    while (a > 0 && near(a - 1, a) && Math.abs(cands[a - 1].endLevel - cands[a].startLevel) < stepTol) a--;
    while (b < m - 1 && near(b, b + 1) && Math.abs(cands[b + 1].startLevel - cands[b].endLevel) < stepTol) b++;
    // Across a chip change a pause holds the old chip's level, the dark moment and the bare new
    // chip, and a layer's slow start or end there (the turning point at a quarter-wave stack's
    // start, a rate wandering low near a turning-point cut) may break the flat into fragments that
    // step by more than stepTol: the search reaches over the fragments on the layer's own side of
    // the chip change (no dark dip between, nearer the layer's level than the other chip's).
    const ownSide = (c: Cand, own: number, other: number | null) => {
      const level = 0.5 * (c.startLevel + c.endLevel);
      return !c.unseen && (other === null || Math.abs(level - own) < Math.abs(level - other));
    };
    if (!sameChipBefore) {
      const own = best.gain * expected[k - 1].startLevel, other = k > 1 ? best.gain * expected[k - 2].endLevel : null;
      while (a > pauses[p].first && ownSide(cands[a - 1], own, other) && !dipBetween(y, cands[a - 1], cands[a])) a--;
    }
    if (!sameChipAfter) {
      const own = best.gain * expected[k - 1].endLevel, other = k < L ? best.gain * expected[k].startLevel : null;
      while (b < pauses[q].last && ownSide(cands[b + 1], own, other) && !dipBetween(y, cands[b], cands[b + 1])) b++;
    }
    // around a pause not seen (a level crossing) the boundary may lie a quarter of the layer either way
    const reach = () => Math.max(30, 0.25 * (t[endIndex - 1] - t[startIndex])) / Math.max((t[n - 1] - t[0]) / Math.max(n - 1, 1), 1e-9);
    windows.push({
      from: cands[a].unseen ? Math.max(0, Math.round(cands[a].startIndex - reach())) : cands[a].startIndex,
      to: cands[b].unseen ? Math.min(n, Math.round(cands[b].endIndex + reach())) : cands[b].endIndex,
    });
    const seen = cands[pauses[q].first].startLevel, want = best.gain * expected[k - 1].endLevel;
    if (Math.abs(seen - want) > 3 * (options.levelTolerance ?? 0.02) * best.gain) {
      misfits.push(`layer ${k} (${design.layers[k - 1].material}) ends at ${(seen / best.gain * 100).toFixed(1)} % where the design expects ${(expected[k - 1].endLevel * 100).toFixed(1)} %`);
    }
  }
  const idle = idleBetween(trace, layers, (l) => expected[l - 1]?.chip ?? 1);
  const warnings = [
    `the trace has no layer column: ${layers.length} layer segment${layers.length === 1 ? '' : 's'} found from the design's monitor levels and the trace's flat stretches (pauses); check them against the design`,
  ];
  if (misfits.length) {
    warnings.push(`the inferred segments may be wrong: ${misfits.slice(0, 5).join('; ')}${misfits.length > 5 ? `; and ${misfits.length - 5} more` : ''} (as a fraction of the detector gain found from the levels)`);
  }
  return { layers, idle, warnings, missing, windows, gain: best.gain };

  function solve(gain: number): { gain: number; cost: number; bounds: ([number, number] | undefined)[]; gainFit: number | null } {
    const tol = (options.levelTolerance ?? 0.02) * gain;
    const lc = (obs: number, exp: number) => Math.min(((obs - gain * exp) / tol) ** 2, CAP);
    // a flat stretch may drift slowly (the approach to a turning point): either of its levels may be the cut's
    const lvl = (f: FlatStretch, exp: number) => Math.min(lc(f.startLevel, exp), lc(f.endLevel, exp));
    const extraCost = options.extraFlatCost ?? 6;
    const skip = options.skipCost ?? 40;
    const P = pauses.length;
    // cost[k][q]: layers 1…k placed (or skipped), the last pause used is q
    let prev = new Float64Array(P).fill(Infinity);
    const from: Int32Array[] = [];
    // b_0: the pause before layer 1; stretches before it are leading idle (free)
    const unseenCost = 3;
    const pauseCost = (q: number) => 0.5 * pauses[q].extra + (cands[pauses[q].first].unseen || cands[pauses[q].last].unseen ? unseenCost : 0);
    for (let q = 0; q < P; q++) prev[q] = lvl(cands[pauses[q].last], expected[0].startLevel) + pauseCost(q);
    for (let k = 1; k <= L; k++) {
      const e = expected[k - 1];
      const next = expected[k];
      const cur = new Float64Array(P).fill(Infinity);
      const arg = new Int32Array(P).fill(-1);
      for (let q = 0; q < P; q++) {
        // skipped layer: the same pause, at a cost (arg −2 − q marks the skip)
        if (prev[q] + skip < cur[q]) {
          cur[q] = prev[q] + skip;
          arg[q] = -2 - q;
        }
      }
      for (let p = 0; p < P; p++) {
        if (!Number.isFinite(prev[p])) continue;
        const a = pauses[p].last;
        const s = cands[a].endIndex;
        let inner = 0, innerCount = 0, innerWeight = 0;
        for (let q = 0; q < P; q++) {
          const b = pauses[q].first;
          if (b <= a) continue;
          // flat stretches strictly between the two pauses lie inside the layer
          if (b - a - 1 > innerCount) {
            for (let c = a + 1 + innerCount; c < b; c++) {
              if (cands[c].unseen) {
                innerCount++;
                continue;
              }
              const lvl = 0.5 * (cands[c].startLevel + cands[c].endLevel);
              inner += e.turningPointLevels.length ? Math.min(...e.turningPointLevels.map((v) => lc(lvl, v))) : 0;
              innerCount++;
              // a short flat inside a layer (noise, a spike's shadow) weighs less than a pause-long one
              innerWeight += Math.min(1, (t[cands[c].endIndex - 1] - t[cands[c].startIndex]) / 10);
            }
          }
          if (innerCount > e.turningPointLevels.length + 6) break;
          const end = cands[b].startIndex;
          if (end - s < 20) continue;
          // a layer's rate far from the run's mean (×2.5 costs one unit) is unlikely: a fringe fragment, not a layer
          const rate = design.layers[k - 1].thicknessNm / Math.max(t[end - 1] - t[s], 1e-9);
          const durCost = Math.min((Math.log(rate / meanRate) / Math.log(2.5)) ** 2, CAP);
          let c = prev[p] + durCost + inner + extraCost * Math.max(0, innerWeight - e.turningPointLevels.length);
          c += lvl(cands[b], e.endLevel) + pauseCost(q);
          // the pause ends where the next layer starts: the same level, or the bare new chip
          if (next) c += lvl(cands[pauses[q].last], next.startLevel);
          if (trace.chip && trace.chip[(s + end) >> 1] !== e.chip) c += 4 * CAP;
          // the shape last: it only adds, so a candidate already dearer than the best needs none
          if (c < cur[q]) c += shapeCost(k, s, end, gain, tol);
          if (c < cur[q]) {
            cur[q] = c;
            arg[q] = p;
          }
        }
      }
      from.push(arg);
      prev = cur;
    }
    let q = 0;
    for (let i = 1; i < P; i++) if (prev[i] < prev[q]) q = i;
    const cost = prev[q];
    const bounds: ([number, number] | undefined)[] = new Array(L + 1);
    let sxy = 0, sxx = 0;
    for (let k = L; k >= 1; k--) {
      const a = from[k - 1][q];
      if (a <= -2) continue; // skipped: the same pause carries on
      bounds[k] = [a, q];
      const e = expected[k - 1];
      const lvl = cands[pauses[q].first].startLevel;
      if (Math.abs(lvl - gain * e.endLevel) < 3 * tol) {
        sxy += lvl * e.endLevel;
        sxx += e.endLevel * e.endLevel;
      }
      q = a;
    }
    return { gain, cost, bounds, gainFit: sxx > 0 ? sxy / sxx : null };
  }
}

/** Idle segments: what lies between the layer segments, each with the chip of the layer after it (the bare-chip stretch belongs to the new chip). */
function idleBetween(trace: TraceData, layers: readonly Segment[], chipOf: (layer: number) => number): Segment[] {
  const out: Segment[] = [];
  let from = 0;
  const push = (a: number, b: number, chip: number) => {
    if (b > a) out.push({ layer: 0, chip, startIndex: a, endIndex: b, startTimeS: trace.timeS[a], endTimeS: trace.timeS[b - 1], sampleCount: b - a, run: 1 });
  };
  for (const s of layers) {
    push(from, s.startIndex, trace.chip ? trace.chip[from] : s.chip);
    from = s.endIndex;
  }
  const last = layers[layers.length - 1];
  push(from, trace.rowCount, trace.chip ? trace.chip[Math.min(from, trace.rowCount - 1)] : last ? last.chip : chipOf(1));
  return out;
}

function median(y: ArrayLike<number>, from: number, to: number): number {
  if (to <= from) return NaN;
  const a = new Float64Array(to - from);
  for (let i = from; i < to; i++) a[i - from] = y[i];
  a.sort();
  const h = a.length >> 1;
  return a.length % 2 ? a[h] : 0.5 * (a[h - 1] + a[h]);
}

function quantile(y: ArrayLike<number>, q: number): number {
  const a = Float64Array.from(y).sort();
  return a[Math.floor(q * (a.length - 1))];
}

/** Whether the reading between two flat stretches falls below half the lower of their levels (a chip change's dark moment). */
function dipBetween(y: ArrayLike<number>, a: FlatStretch, b: FlatStretch): boolean {
  const floor = 0.5 * Math.min(a.endLevel, b.startLevel);
  for (let i = a.endIndex; i < b.startIndex; i++) if (y[i] < floor) return true;
  return false;
}

/** Sample indices where 1 s means of the reading cross one of the levels (at most one per level every 10 s), as zero-length unseen pauses. */
function levelCrossings(t: ArrayLike<number>, y: ArrayLike<number>, levels: readonly number[]): Cand[] {
  const n = y.length;
  if (n < 4) return [];
  const dt = (t[n - 1] - t[0]) / (n - 1);
  const per = Math.max(1, Math.round(1 / Math.max(dt, 1e-9)));
  const out: Cand[] = [];
  for (const level of levels) {
    let last = -Infinity, prevSign = 0;
    for (let a = 0; a + per <= n; a += per) {
      let sum = 0;
      for (let i = a; i < a + per; i++) sum += y[i];
      const sign = Math.sign(sum / per - level);
      if (sign !== 0 && prevSign !== 0 && sign !== prevSign && t[a] - last > 10) {
        out.push({ startIndex: a, endIndex: a, startLevel: level, endLevel: level, unseen: true });
        last = t[a];
      }
      if (sign !== 0) prevSign = sign;
    }
  }
  return out;
}
