import { fromNK, growingLayerSignal, type LayerAt } from '../optics';
import { levelSteps, longRunSigma, type TraceData } from '../trace';
import { type LayerEstimate } from './fitLayers';
import { type FitLayerData, type MonitorOptics } from './layerModel';
import { endEquivalentLaw, lawThickness } from './rateWander';
import { type LayerSamples } from './layerSamples';

/** The idle reading after a cut, once the shutter has closed. */
export interface SettledLevel {
  level: number;
  /** 1σ of the level (long-run noise over the level's samples). */
  sigma: number;
  /** Index of its first sample in the trace. */
  startIndex: number;
  samples: number;
}

/** Longest idle stretch read for the settled level, samples. */
const MAX_IDLE_SAMPLES = 600;

/**
 * The first level of the idle stretch [from, to) long enough to be settled (at least 10
 * samples): what follows a cut is the growth while the shutter closes (a staircase of short
 * levels), then the settled reading, then possibly a chip change. Null without such a level.
 */
export function settledLevelAfter(signal: Float64Array, from: number, to: number): SettledLevel | null {
  const end = Math.min(to, from + MAX_IDLE_SAMPLES);
  if (end - from < 10) return null;
  const part = signal.subarray(from, end);
  const levels = levelSteps(part, { minLength: 3 });
  const first = levels.find((l) => l.end - l.start >= 10);
  if (!first) return null;
  const n = first.end - first.start;
  // σ of the mean from the level's own scatter, inflated for correlation by the lag-1 autocorrelation (AR(1)).
  let s0 = 0, s1 = 0;
  for (let i = first.start; i < first.end; i++) {
    const r = part[i] - first.mean;
    s0 += r * r;
    if (i > first.start) s1 += r * (part[i - 1] - first.mean);
  }
  const rho = s0 > 0 ? Math.min(Math.max(s1 / s0, 0), 0.95) : 0;
  const sigma = Math.sqrt((s0 / Math.max(n - 1, 1) / n) * ((1 + rho) / (1 - rho)));
  return { level: first.mean, sigma, startIndex: from + first.start, samples: n };
}

export interface GrowthAfterCut {
  /** Thickness grown after the last logged sample, nm (0 when none is seen). */
  afterCutNm: number;
  afterCutSigmaNm: number;
  /** 'level': where the modelled signal meets the settled level; 'flat': the model is too flat there to tell (taken as 0); 'off-curve': the level is not on the modelled curve. */
  method: 'level' | 'flat' | 'off-curve';
}

export interface GrowthInput {
  optics: MonitorOptics;
  below: readonly LayerAt[];
  index: number;
  extinction: number;
  /** Thickness at the last logged sample, nm. */
  endNm: number;
  gain: number;
  settled: SettledLevel;
  /** Mean of the layer's last logged readings, and its σ. */
  lastReading: number;
  lastReadingSigma: number;
  /** Most growth considered, nm (the rate times the longest shutter time). */
  maxNm: number;
}

/**
 * The growth after a cut, from the settled idle level: the film keeps growing while the shutter
 * closes, and the reading settles where the modelled signal of the layer at its final thickness
 * lies. Continuing the layer's own curve from its last logged thickness, the first thickness at
 * which the modelled change gain·(M(d) − M(d_end)) equals the change from the last logged
 * readings to the settled level is the deposited thickness; its σ is that change's σ over the
 * slope there. Where the curve is flat (a cut at a turning point) the level
 * cannot tell the growth and none is added.
 */
export function growthAfterCut(input: GrowthInput): GrowthAfterCut {
  const { gain, settled, maxNm } = input;
  const steps = 120;
  const d = new Float64Array(steps + 1);
  for (let i = 0; i <= steps; i++) d[i] = input.endNm + (maxNm * i) / steps;
  const m = growingLayerSignal({ ...input.optics, below: input.below, growing: fromNK(input.index, input.extinction), pol: 's' }, d);
  // The change from the last logged readings to the settled level, against the model's change
  // from the last logged thickness (the model's own small misfit at the end cancels).
  const change = settled.level - input.lastReading;
  const f = Float64Array.from(m, (v) => gain * (v - m[0]) - change);
  const sigma = Math.hypot(settled.sigma, input.lastReadingSigma);
  // No change seen: nothing grew after the cut that the signal can show.
  if (Math.abs(change) <= 3 * sigma) return { afterCutNm: 0, afterCutSigmaNm: slopeSigma(f, 0, maxNm / steps, sigma, maxNm), method: 'level' };
  for (let i = 1; i <= steps; i++) {
    if (Math.sign(f[i]) !== Math.sign(f[i - 1])) {
      const frac = f[i - 1] / (f[i - 1] - f[i]);
      const afterCutNm = ((i - 1 + frac) * maxNm) / steps;
      const s = slopeSigma(f, i, maxNm / steps, sigma, maxNm);
      if (s > 0.5 * maxNm) return { afterCutNm: 0, afterCutSigmaNm: s, method: 'flat' };
      return { afterCutNm, afterCutSigmaNm: s, method: 'level' };
    }
  }
  return { afterCutNm: 0, afterCutSigmaNm: 0, method: 'off-curve' };
}

/** σ of the crossing thickness: level σ over |df/dd| near grid point i. */
function slopeSigma(f: Float64Array, i: number, h: number, sigma: number, cap: number): number {
  const a = Math.max(i - 1, 0), b = Math.min(i + 1, f.length - 1);
  const slope = Math.abs(f[b] - f[a]) / ((b - a) * h);
  return slope > 0 ? Math.min(sigma / slope, cap) : cap;
}

/** Readings averaged for the layer's last level. */
const LAST_READINGS = 5;

/** Longest shutter closing time considered, s. */
const MAX_SHUTTER_S = 2;

export interface LayerEndInput {
  signal: Float64Array;
  timeS: Float64Array;
  /** Trace index of the layer's last logged sample, and of the next layer's first (or the trace's end). */
  lastIndex: number;
  nextStart: number;
  optics: MonitorOptics;
  below: readonly LayerAt[];
  index: number;
  extinction: number;
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  /** Time from the layer's start to its last logged sample, s. */
  durationS: number;
  gain: number;
  noiseSigma: number;
}

export interface LayerEnd extends GrowthAfterCut {
  settled: SettledLevel;
  /** The growth as extra deposition time at the layer's final rate, s. */
  extraS: number;
}

/** The end of a layer: its settled idle level and the growth after the logged cut (null without an idle level after it). */
export function layerEnd(input: LayerEndInput): LayerEnd | null {
  const settled = settledLevelAfter(input.signal, input.lastIndex + 1, input.nextStart);
  if (!settled) return null;
  const T = input.durationS;
  const endNm = input.rateNmPerS * T + 0.5 * input.rateDriftNmPerS2 * T * T;
  const finalRate = input.rateNmPerS + input.rateDriftNmPerS2 * T;
  if (!(finalRate > 0) || !(endNm > 0) || input.lastIndex + 1 < LAST_READINGS * 4) return null;
  let last = 0, k = 0, back = 0;
  for (let i = input.lastIndex; i > input.lastIndex - LAST_READINGS; i--, k++) {
    last += input.signal[i];
    back += input.timeS[input.lastIndex] - input.timeS[i];
  }
  // The last readings sit on average `back` s before the last one: start the curve there.
  back /= k;
  const refNm = input.rateNmPerS * (T - back) + 0.5 * input.rateDriftNmPerS2 * (T - back) ** 2;
  const growth = growthAfterCut({
    optics: input.optics, below: input.below, index: input.index, extinction: input.extinction, endNm: refNm, gain: input.gain,
    settled, lastReading: last / k, lastReadingSigma: longRunSigma(input.signal.subarray(input.lastIndex + 1 - LAST_READINGS * 4, input.lastIndex + 1)) / Math.sqrt(k),
    maxNm: finalRate * MAX_SHUTTER_S,
  });
  const afterCutNm = Math.max(0, growth.afterCutNm - (endNm - refNm));
  return { ...growth, afterCutNm, settled, extraS: afterCutNm / finalRate };
}

/**
 * Whether a layer starts where the one below ended: its first readings against the settled idle
 * level after the layer below (same chip, no chip change between). A message naming the layer
 * when they differ by more than 5σ and 0.2 % of the level, else null.
 */
export function startCheck(layer: number, below: number, settled: SettledLevel, firstReadings: ArrayLike<number>, noiseSigma: number): string | null {
  const n = Math.min(firstReadings.length, 5);
  if (n === 0) return null;
  let start = 0;
  for (let i = 0; i < n; i++) start += firstReadings[i] / n;
  const diff = start - settled.level;
  const sigma = Math.hypot(settled.sigma, noiseSigma / Math.sqrt(n));
  if (Math.abs(diff) <= Math.max(5 * sigma, 0.002 * Math.abs(settled.level))) return null;
  return `layer ${layer} starts at a reading of ${start.toFixed(4)}, but the reading settled at ${settled.level.toFixed(4)} after layer ${below}: ` +
    'the layer does not start where the one below ended (the stack changed during the pause, or the segmentation or chip assignment is wrong)';
}

/** What layerEnds needs of a fitted layer (a LayerState's parts). */
export interface EndedLayer {
  design: { layer: number };
  samples: LayerSamples;
  optics: MonitorOptics;
  nominal: { im: number };
  estimate: LayerEstimate;
  fit: FitLayerData;
  refit: FitLayerData;
}

/**
 * Per run: after each layer's fit, its end (layerEnd) is applied: the growth after the logged
 * cut extends the layer's time base (so its thickness, and the stack below the next layer, are
 * the final ones), and the next layer on the chip is checked to start at the settled level.
 * Returns the function to call per layer (in deposition order), giving the extra time, s.
 */
export function layerEnds(trace: TraceData, samplesByLayer: ReadonlyMap<number, LayerSamples>, warnings: string[]) {
  const starts = [...samplesByLayer.values()].map((s) => s.indices[0]).sort((a, b) => a - b);
  let previous: { chip: number; layer: number; settled: SettledLevel | null } | null = null;
  return (s: EndedLayer, below: readonly LayerAt[], noiseSigma: number): number => {
    const { samples, estimate: e } = s;
    const n = samples.indices.length;
    const lastIndex = samples.indices[n - 1];
    const nextStart = starts.find((i) => i > lastIndex) ?? trace.signal.length;
    if (previous && previous.chip === samples.chip && previous.settled) {
      const first = Array.from({ length: Math.min(5, n) }, (_, i) => trace.signal[samples.indices[i]]);
      const note = startCheck(s.design.layer, previous.layer, previous.settled, first, noiseSigma);
      if (note) warnings.push(note);
    }
    const end = layerEnd({
      signal: trace.signal, timeS: trace.timeS, lastIndex, nextStart, optics: s.optics, below, index: e.index, extinction: -s.nominal.im,
      ...endEquivalentLaw(e, s.fit.wander, s.fit.durationS), durationS: s.fit.durationS, gain: e.gain, noiseSigma,
    });
    previous = { chip: samples.chip, layer: s.design.layer, settled: end?.settled ?? null };
    if (!end) return 0;
    if (end.method === 'off-curve') {
      warnings.push(`layer ${s.design.layer}: the idle reading after the cut (${end.settled.level.toFixed(4)}) is not on the layer's modelled curve within ${MAX_SHUTTER_S} s of further growth; no growth after the cut added`);
    }
    if (end.extraS <= 0) return 0;
    s.fit.durationS += end.extraS;
    s.refit.durationS += end.extraS;
    const T = s.fit.durationS;
    const d = lawThickness(e, s.fit.wander, T);
    const sd = Math.hypot(e.thicknessSigmaNm, end.afterCutSigmaNm);
    s.estimate = {
      ...e, thicknessNm: d, thicknessSigmaNm: sd, opticalThicknessNm: e.index * d,
      opticalThicknessSigmaNm: Math.hypot(e.opticalThicknessSigmaNm, e.index * end.afterCutSigmaNm),
    };
    return end.extraS;
  };
}
