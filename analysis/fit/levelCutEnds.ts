import { monitorCurve, type Design } from '../design';
import { type Segment, type TraceData } from '../trace';
import { solveDense } from '../trace/polyFit';
import { expectedLevels, type ExpectedLayer } from './expectedLevels';
import { fitAr1PlusWhite } from '../stats/correlatedNoise';
import { gapsBetween, idleNoiseModel } from './idleNoiseModel';

/** The fewest pause readings whose variogram sets the noise's scale for the bent curves where the run's pauses tell nothing (see chosen). */
const MIN_PAUSE_SAMPLES = 20;

export interface LevelCutEndOptions {
  /** How far either way of the placed boundary the cut and the next start are searched, s. @default 40 */
  searchS?: number;
  /** Readings beyond the search span on either side that set the slopes, s. @default 20 */
  slopeS?: number;
  /** The fraction of the layer (and of the next) the search reaches at most. @default 0.4 */
  searchFraction?: number;
  /** Rounds (each layer's rate from the last round's boundaries). @default 3 */
  rounds?: number;
  /**
   * Powers of the time from a breakpoint added to each design curve where the readings show them
   * (Schwarz's criterion; `chosen`): the film's curve near the cut is not the design's. 0: the
   * design's curves alone. From the second round on (see levelCutEnds). @default 2
   */
  bend?: number;
}

/**
 * The end of each level-cut layer placed without a layer column, and the start of the layer after
 * it, where the readings reach and leave the cut level. A controller cuts a level-cut layer when
 * the reading crosses the design's trigger level (common practice), so the pause after the cut
 * sits at gain × the design's cut level (fit/expectedLevels; the gain from the bare chip). Around
 * each such boundary the readings are fitted by the layer's design curve into that level, flat at
 * it, and the next layer's design curve out of it (each scaled, its sign kept, and stretched in
 * time by up to ±15 %: the film's index is not the design's), the two breakpoints searched on
 * every pair of samples. A short pause on a shallow fringe shows no flat stretch of its own
 * (designSegments found it from the level crossing), and the whole-layer fit of placeBoundaries
 * then trades the boundary against the thin layers' thicknesses (measured on the chamber
 * simulator's BBAR: ends up to 6 s late). Layers cut at a turning point are left as placed.
 */
export function levelCutEnds(trace: TraceData, design: Design, layers: readonly Segment[], gain: number, options: LevelCutEndOptions = {}): Segment[] {
  let out = layers.map((s) => ({ ...s }));
  // The bent curves from the second round on: the first round's rates come from the boundaries
  // placed before (fit/placeBoundaries), on the no-layer-column demo trace 25–28 s off around
  // layer 2's end, a rate beyond the curves' ±15 % stretches, and there the quadratic took up the
  // wrong stretch, not the film's curve (a χ² gain of 30 long-run variances, kept): the end it
  // moved set the next rounds' rates, and those rounds' plain fits landed elsewhere.
  const expected = expectedLevels(design);
  const rounds = options.rounds ?? 3;
  for (let round = 0; round < rounds; round++) out = levelCutRound(trace, design, expected, out, gain, round === 0 ? { ...options, bend: 0 } : options, round === rounds - 1);
  return out;
}

/** Time stretches of the design curves tried: the film's rate and index are not the design's. */
const STRETCH = [0.85, 0.925, 1, 1.075, 1.15];

/** One round of levelCutEnds; the last (`lastRound`) gives each boundary its spread. */
function levelCutRound(
  trace: TraceData, design: Design, expected: readonly ExpectedLayer[], layers: readonly Segment[], gain: number, options: LevelCutEndOptions, lastRound: boolean,
): Segment[] {
  const out = layers.map((s) => ({ ...s }));
  const t = trace.timeS, y = trace.signal;
  const chipGain = bareChipGains(t, y, out, expected, gain);
  const runVariance = (options.bend ?? 2) > 0 ? pausesLongRunVariance(trace, out) : NaN;
  for (let j = 0; j < out.length; j++) {
    const seg = out[j];
    const dl = design.layers[seg.layer - 1];
    if (!dl || dl.monitor.cut !== 'level') continue;
    if (j === 0 || out[j - 1].chip !== seg.chip) out[j] = firstStart(trace, design, seg, j > 0 ? out[j - 1].endIndex : 0, (chipGain.get(seg.chip) ?? gain) * expected[seg.layer - 1].startLevel, runVariance, options);
    const nxt = j + 1 < out.length && out[j + 1].layer === seg.layer + 1 && out[j + 1].chip === seg.chip ? out[j + 1] : null;
    const g = chipGain.get(seg.chip) ?? gain;
    if (!(g > 0)) continue;
    const level = g * expected[seg.layer - 1].endLevel;
    const durS = t[seg.endIndex - 1] - t[seg.startIndex];
    const nextDurS = nxt ? t[nxt.endIndex - 1] - t[nxt.startIndex] : Infinity;
    const fraction = options.searchFraction ?? 0.4;
    const search = Math.min(options.searchS ?? 40, fraction * durS, fraction * nextDurS);
    const slope = options.slopeS ?? 20;
    const endS = t[seg.endIndex - 1], startS = nxt ? t[nxt.startIndex] : endS;
    // the readings: from the layer's middle at the earliest to the next layer's middle (or the trace's end)
    let from = seg.endIndex - 1;
    while (from > seg.startIndex + ((seg.endIndex - seg.startIndex) >> 1) && t[from - 1] >= endS - search - slope) from--;
    const last = nxt ? nxt.startIndex + ((nxt.endIndex - nxt.startIndex) >> 1) : Math.min(trace.rowCount, j + 1 < out.length ? out[j + 1].startIndex : trace.rowCount);
    let to = nxt ? nxt.startIndex : seg.endIndex;
    while (to < last && t[to] <= startS + search + slope) to++;
    const rate = dl.thicknessNm / Math.max(durS, 1e-9);
    const into = STRETCH.map((k) => shapeOf(design, seg.layer, 'end', k * rate));
    const outOf = nxt ? STRETCH.map((k) => shapeOf(design, nxt.layer, 'start', (k * design.layers[nxt.layer - 1].thicknessNm) / Math.max(nextDurS, 1e-9))) : null;
    const best = chosen(options.bend ?? 2, runVariance, lastRound, t, y, level, from, to, [endS - search, endS + search], nxt ? [startS - search, startS + search] : null, into, outOf);
    if (!best) continue;
    // (seg: a chip's first layer keeps the start placeBoundaries gave it, not firstStart's, which
    // stands only where no end is placed. Kept throughout, firstStart's start was the closer under
    // white noise and the farther under correlated noise: no-layer-column BBAR, refit, seeds
    // 101–112, max 1.38 → 0.69 % and 1.38 → 3.41 %; seeds 1–16 correlated 2.56 → 3.64 %.)
    out[j] = { ...seg, endIndex: best.end, endTimeS: t[best.end - 1], sampleCount: best.end - seg.startIndex, ...(best.sigma ? { endSigmaS: best.sigma.endS } : {}) };
    if (nxt) out[j + 1] = { ...nxt, startIndex: best.start, startTimeS: t[best.start], sampleCount: nxt.endIndex - best.start, ...(best.sigma ? { startSigmaS: best.sigma.startS } : {}) };
  }
  return out;
}

/**
 * The start of a chip's first layer: flat at the bare chip's level, then the layer's design curve
 * out of it. Searched at most 8 s either way (before it lie the chip change's steps), on the
 * 10 s before it.
 */
function firstStart(trace: TraceData, design: Design, seg: Segment, notBefore: number, level: number, runVariance: number, options: LevelCutEndOptions): Segment {
  const t = trace.timeS, y = trace.signal;
  if (!(level > 0)) return seg;
  const durS = t[seg.endIndex - 1] - t[seg.startIndex];
  const search = Math.min(8, options.searchS ?? 40, (options.searchFraction ?? 0.4) * durS);
  const startS = t[seg.startIndex];
  let from = seg.startIndex;
  while (from > notBefore && t[from - 1] >= startS - search - 10) from--;
  let to = seg.startIndex;
  while (to < seg.endIndex && t[to] <= startS + search + (options.slopeS ?? 20)) to++;
  if (from + 1 >= to) return seg;
  const outOf = STRETCH.map((k) => shapeOf(design, seg.layer, 'start', (k * design.layers[seg.layer - 1].thicknessNm) / Math.max(durS, 1e-9)));
  const best = chosen(options.bend ?? 2, runVariance, false, t, y, level, from, to, [t[from + 1], t[from + 1]], [startS - search, startS + search], [() => 0], outOf);
  return best ? { ...seg, startIndex: best.start, startTimeS: t[best.start], sampleCount: seg.endIndex - best.start } : seg;
}

/**
 * The design's monitor curve near a layer's end (as a function of the time before it) or start
 * (of the time after it), less its level there, at `rate`: the shape the readings leave or reach
 * the cut level by. Tabulated every 0.1 s over 60 s.
 */
function shapeOf(design: Design, layerNo: number, at: 'start' | 'end', rate: number): (dtS: number) => number {
  const d = design.layers[layerNo - 1].thicknessNm;
  const stepS = 0.1, count = 601;
  const grid = new Float64Array(count);
  for (let i = 0; i < count; i++) grid[i] = at === 'end' ? Math.max(d - rate * i * stepS, 0) : rate * i * stepS;
  const m = monitorCurve(design, layerNo, grid, { pol: 's' });
  return (dtS) => {
    const x = Math.min(Math.max(dtS / stepS, 0), count - 1.001);
    const k = Math.floor(x);
    return m[k] + (x - k) * (m[k + 1] - m[k]) - m[0];
  };
}

/**
 * Each chip's gain from the bare chip: the mean reading over the 10 s before its first layer starts
 * (1 s clear of the start), against the design's level there; a 0.1 % gain error moves a cut level
 * by 1e-3, seconds on a shallow fringe, and the levels' own match (designSegments) is no closer.
 * Where that stretch is missing (a run that starts growing), the matched gain.
 */
function bareChipGains(
  t: ArrayLike<number>, y: ArrayLike<number>, layers: readonly Segment[], expected: readonly { startLevel: number }[], fallback: number,
): Map<number, number> {
  const out = new Map<number, number>();
  let previousEnd = 0;
  for (const seg of layers) {
    if (!out.has(seg.chip)) {
      const startS = t[seg.startIndex];
      let sum = 0, count = 0;
      for (let i = seg.startIndex - 1; i >= previousEnd && t[i] >= startS - 11; i--) {
        if (t[i] > startS - 1) continue;
        sum += y[i];
        count++;
      }
      const level = expected[seg.layer - 1]?.startLevel ?? NaN;
      out.set(seg.chip, count >= 20 && level > 0 ? sum / count / level : fallback);
    }
    previousEnd = seg.endIndex;
  }
  return out;
}

/**
 * The detector's long-run noise variance (fit/idleNoiseModel: white + AR(1), every pause's level
 * steps pooled) from the stretches between the layers as placed and after the last. One pause
 * (48 s on the no-layer-column demo trace, about 50 correlation times) reads it to some 30 %:
 * there 4.1–4.7e-3 for a long-run σ of 5.3e-3 (the simulator's white 0.04 % and AR(1) 0.06 % of
 * full scale at ρ = e^(−0.1)), and layer 4's end, cut 3 % past a turning point where the design's
 * curve is itself nearly a quadratic in time, kept a quadratic 4 s early (its thickness 0.3 %
 * further off); on the simulator with that noise, seed 15, one pause moved layer 2's cut 28 s.
 * Pooled, 5.8–6.3e-3. Where a gap still holds a layer's slow start (a boundary the last round
 * left 10 s off) it reads high, and the design's curves are kept as they are. NaN where no step is
 * long enough.
 */
function pausesLongRunVariance(trace: TraceData, layers: readonly Segment[]): number {
  const lastEnd = layers.reduce((m, l) => Math.max(m, l.endIndex), 0);
  const noise = idleNoiseModel(trace, [...gapsBetween(layers), { startIndex: lastEnd, endIndex: trace.rowCount }]);
  return noise ? noise.longRunSigma ** 2 : NaN;
}

/**
 * The breakpoints on the design's curves as they are, and again with a quadratic in the time from
 * each breakpoint added to each curve (`bend` terms a side); the bent fit kept where its χ² gain
 * clears Schwarz's penalty (ln n per term) in units of the readings' noise. The film's index and the
 * stack below are not the design's, so its curve into and out of the cut level is not the design's
 * scaled and stretched: on the chamber simulator's BBAR at white noise 1e-5 (no layer column) the
 * curves' misfit moved the cuts 0.3–0.7 s (layer 2's cut 0.7 s early, n·d of layer 1 −1.5 %); at
 * the scenario's own noise the quadratics are seldom kept, where free they moved a boundary by
 * tens of seconds (n·d errors to 87 %).
 */
function chosen(
  bend: number, runVariance: number, withSpread: boolean, ...args: Parameters<typeof breakpoints>
): { end: number; start: number; sigma: { endS: number; startS: number } | null } | null {
  const plain = breakpoints(...args);
  if (!plain) return null;
  const [t, y, level, from, to, endSpan, startSpan, into, outOf] = args;
  // The noise's scale for a slow term's χ² gain: its long-run variance σ_w² + σ_x²·(1 + ρ)/(1 − ρ)
  // (a smooth regressor sees the noise's spectral density at zero, not its per-sample variance).
  // Second differences see (1 − ρ)(3 − ρ)/3 of an AR(1) part's variance: on a detector whose noise
  // is correlated over ~10 samples they kept the quadratic everywhere and the boundaries left the
  // layers. The run's pauses pooled (pausesLongRunVariance); where they tell nothing, white + AR(1)
  // fitted to the variogram of this pause alone, lags to its half, and too short a pause: the
  // design's curves as they are. The same scale for the breakpoints' spread (a breakpoint moves a
  // stretch of the readings from one smooth curve to another).
  let variance = runVariance;
  if (!(variance > 0) && bend > 0) {
    const pauseEnd = startSpan ? plain.start : to; // the run's last layer: flat to the window's end
    const pause = Float64Array.from({ length: pauseEnd - plain.end }, (_, i) => y[plain.end + i]);
    if (pause.length >= MIN_PAUSE_SAMPLES) variance = fitAr1PlusWhite(pause, Math.floor(pause.length / 2)).longRunSigma ** 2;
  }
  const pick = (b: Breakpoints) => ({ end: b.end, start: b.start, sigma: withSpread && variance > 0 ? b.sigmas(variance) : null });
  if (!(bend > 0) || !(variance > 0)) return pick(plain);
  const bent = breakpoints(t, y, level, from, to, endSpan, startSpan, into, outOf, bend);
  if (!bent) return pick(plain);
  const terms = (startSpan ? 2 : 1) * bend;
  if (!(plain.cost - bent.cost > terms * Math.log(to - from) * variance)) return pick(plain);
  // The curves' misfit that the bend is for (the film's index and the stack below, the curves
  // already stretched ±15 %) moved the boundaries by 0.7 s at most on quiet traces; a rate that
  // wanders also bends the readings in time, and there the bent breakpoints float (a 5 % wander
  // over 20 s, seed 101 of the correlated-noise BBAR: layer 2's cut 24 s early, refit −21 %). A
  // bent boundary more than MAX_BEND_SHIFT_S from the plain one is taken as that, not the film.
  const shift = Math.max(Math.abs(t[bent.end - 1] - t[plain.end - 1]), startSpan ? Math.abs(t[bent.start] - t[plain.start]) : 0);
  return shift <= MAX_BEND_SHIFT_S ? pick(bent) : pick(plain);
}

/** The most a bent curve may move a boundary from the design curves' placement, s (see chosen; 0.7 s seen, chosen here with a margin). */
const MAX_BEND_SHIFT_S = 2;

/** Where the readings reach and leave the cut level (sample indices), the fit's cost, and each breakpoint's spread (s) at noise variance v. */
interface Breakpoints {
  end: number;
  start: number;
  cost: number;
  sigmas: (v: number) => { endS: number; startS: number };
}

/**
 * Samples [from, to): the readings reach `level` on the layer's design curve (`into`, a scale ≥ 0
 * fitted: the slope's sign is the design's, so the level is not taken where it is crossed the
 * other way) over [from, e), stay flat at it over [e, s), and leave it on the next layer's curve
 * (`outOf`, scaled likewise) over [s, to); without a next layer flat to the end. e's time within
 * `endSpan`, s's within `startSpan`, e ≤ s. Least squares, every pair 0.5 s apart, then every
 * sample pair within 0.5 s of the best; null when nothing fits.
 */
function breakpoints(
  t: ArrayLike<number>, y: ArrayLike<number>, level: number, from: number, to: number,
  endSpan: [number, number], startSpan: [number, number] | null,
  into: readonly ((dtS: number) => number)[], outOf: readonly ((dtS: number) => number)[] | null, bend = 0,
): Breakpoints | null {
  const n = to - from;
  if (n < 20) return null;
  const RR = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) RR[i + 1] = RR[i] + (y[from + i] - level) ** 2;
  const flat = (a: number, b: number) => RR[b] - RR[a];
  // r ≈ a·f over [a, b), a ≥ 0: the residual
  const scaled = (a: number, b: number, f: (i: number) => number): number => {
    let rf = 0, ff = 0;
    for (let i = a; i < b; i++) {
      const v = f(i);
      rf += (y[from + i] - level) * v;
      ff += v * v;
    }
    return !(ff > 0) || rf < 0 ? flat(a, b) + (rf < 0 ? Infinity : 0) : flat(a, b) - (rf * rf) / ff;
  };
  // r ≈ a·f + b₁·u + … + b_bend·u^bend over [a, b), u the time from the breakpoint (per 10 s), a ≥ 0:
  // the residual from the normal equations (at most 3 × 3)
  const bentScaled = (a: number, b: number, f: (i: number) => number, u: (i: number) => number): number => {
    if (bend === 0) return scaled(a, b, f);
    const m = bend + 1;
    const N = new Float64Array(m * m), r = new Float64Array(m), v = new Float64Array(m);
    for (let i = a; i < b; i++) {
      const x = u(i) / 10;
      v[0] = f(i);
      for (let p = 1; p < m; p++) v[p] = p === 1 ? x : v[p - 1] * x;
      const ri = y[from + i] - level;
      for (let p = 0; p < m; p++) {
        r[p] += v[p] * ri;
        for (let q = 0; q < m; q++) N[p * m + q] += v[p] * v[q];
      }
    }
    const sol = solveDense(N, r.slice(), m);
    if (!sol) return flat(a, b);
    if (sol[0] < 0) return Infinity;
    let red = 0;
    for (let p = 0; p < m; p++) red += sol[p] * r[p];
    return flat(a, b) - red;
  };
  const inside = (i: number, span: [number, number]) => t[from + i] >= span[0] && t[from + i] <= span[1];
  // the cost of the readings before each trial end, and after each trial start (computed as asked for)
  const before = new Float64Array(n + 1).fill(NaN), after = new Float64Array(n + 1).fill(NaN);
  const costBefore = (e: number): number => {
    if (Number.isNaN(before[e])) {
      const te = t[from + e];
      before[e] = Infinity;
      for (const f of into) before[e] = Math.min(before[e], bentScaled(0, e, (i) => f(te - t[from + i]), (i) => te - t[from + i]));
    }
    return before[e];
  };
  const costAfter = (s: number): number => {
    if (Number.isNaN(after[s])) {
      const ts = t[from + s];
      after[s] = Infinity;
      for (const f of outOf!) after[s] = Math.min(after[s], bentScaled(s, n, (i) => f(t[from + i] - ts), (i) => t[from + i] - ts));
    }
    return after[s];
  };
  // every `step`-th pair over the spans, then every pair within a step of the best
  const pass = (step: number, e0: number, e1: number, s0: number, s1: number) => {
    let found: { end: number; start: number; cost: number } | null = null, foundCost = Infinity;
    for (let e = Math.max(1, e0); e <= Math.min(n - 1, e1); e += step) {
      if (!inside(e, endSpan) || !Number.isFinite(costBefore(e))) continue;
      if (!startSpan || !outOf) {
        const c = before[e] + flat(e, n);
        if (c < foundCost) [found, foundCost] = [{ end: e, start: e, cost: c }, c];
        continue;
      }
      for (let s = Math.max(e, s0); s <= Math.min(n - 2, s1); s += step) {
        if (!inside(s, startSpan) || !Number.isFinite(costAfter(s))) continue;
        const c = before[e] + flat(e, s) + after[s];
        if (c < foundCost) [found, foundCost] = [{ end: e, start: s, cost: c }, c];
      }
    }
    return found;
  };
  const dt = (t[to - 1] - t[from]) / Math.max(n - 1, 1);
  const stride = Math.max(1, Math.round(0.5 / Math.max(dt, 1e-9)));
  const coarse = pass(stride, 1, n - 1, 1, n - 2);
  if (!coarse) return null;
  const fine = stride > 1 ? pass(1, coarse.end - stride, coarse.end + stride, coarse.start - stride, coarse.start + stride) ?? coarse : coarse;
  // Each breakpoint's spread with the other held at its best: its cost over its span (every
  // stride-th sample, every sample within a stride of the best) as a likelihood exp(−Δcost / 2v)
  // under a flat prior, v the noise's variance; the root-mean-square distance from the best, s.
  // (the coarse trials on the search's own grid, `origin` + a multiple of the stride, whose costs it has)
  const spread = (v: number, cost: (k: number) => number, lo: number, hi: number, at: number, origin: number): number => {
    const ks = new Set<number>();
    for (let k = lo + ((((origin - lo) % stride) + stride) % stride); k <= hi; k += stride) ks.add(k);
    for (let k = Math.max(lo, at - stride); k <= Math.min(hi, at + stride); k++) ks.add(k);
    const sorted = [...ks].sort((a, b) => a - b);
    const c0 = cost(at);
    let w = 0, m2 = 0;
    sorted.forEach((k, i) => {
      const c = cost(k);
      if (!Number.isFinite(c)) return;
      // each trial stands for the time halfway to its neighbours
      const cell = (t[from + sorted[Math.min(i + 1, sorted.length - 1)]] - t[from + sorted[Math.max(i - 1, 0)]]) / 2;
      const wk = Math.exp(-Math.max(0, c - c0) / (2 * v)) * cell;
      w += wk;
      m2 += wk * (t[from + k] - t[from + at]) ** 2;
    });
    // (and no less than a place on the sample grid allows: uniform over one sample step, the
    // uniform distribution's variance dt²/12, common practice for a quantised reading)
    return w > 0 ? Math.sqrt(m2 / w + (dt * dt) / 12) : 0;
  };
  const span = (s: [number, number], lo: number, hi: number): [number, number] => {
    let a = hi + 1, b = lo - 1;
    for (let k = lo; k <= hi; k++) if (inside(k, s)) [a, b] = [Math.min(a, k), Math.max(b, k)];
    return [a, b];
  };
  const sigmas = (v: number) => {
    if (!(v > 0)) return { endS: 0, startS: 0 };
    const pair = !!(startSpan && outOf);
    const [elo, ehi] = span(endSpan, 1, pair ? fine.start : n - 1);
    const endS = spread(v, (e) => costBefore(e) + (pair ? flat(e, fine.start) + costAfter(fine.start) : flat(e, n)), elo, ehi, fine.end, 1);
    if (!pair) return { endS, startS: 0 };
    const [slo, shi] = span(startSpan!, fine.end, n - 2);
    const startS = spread(v, (k) => costBefore(fine.end) + flat(fine.end, k) + costAfter(k), slo, shi, fine.start, coarse.end);
    return { endS, startS };
  };
  return { end: from + fine.end, start: from + fine.start, cost: fine.cost, sigmas };
}
