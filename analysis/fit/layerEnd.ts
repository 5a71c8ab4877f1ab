import { fromNK, growingLayerSignal, type LayerAt } from '../optics';
import { levelSteps } from '../trace';
import { thicknessAt, type MonitorOptics } from './layerModel';

/** The idle reading after a cut, once the shutter has closed. */
export interface SettledLevel {
  level: number;
  /** 1σ of the level (its own scatter, inflated for correlation). */
  sigma: number;
  /** Index of its first sample in the trace. */
  startIndex: number;
  samples: number;
}

/** Longest idle stretch read for the settled level, samples. */
const MAX_IDLE_SAMPLES = 600;

/**
 * The factor by which AR(1) noise with lag-1 autocorrelation ρ widens the σ of a mean (or of a
 * line's intercept) over white noise: √((1 + ρ)/(1 − ρ)) (G. E. P. Box, G. M. Jenkins, Time
 * Series Analysis, the AR(1) process; from memory). ρ from the values' own lag-1 products,
 * capped at 0.95 so that a short stretch does not claim infinite correlation.
 */
export function ar1Inflation(residuals: ArrayLike<number>): number {
  let s0 = 0, s1 = 0;
  for (let i = 0; i < residuals.length; i++) {
    s0 += residuals[i] * residuals[i];
    if (i > 0) s1 += residuals[i] * residuals[i - 1];
  }
  const rho = s0 > 0 ? Math.min(Math.max(s1 / s0, 0), 0.95) : 0;
  return Math.sqrt((1 + rho) / (1 - rho));
}

/** Mean of values[from, to) and its σ (sample σ/√n, times ar1Inflation). */
export function meanSigma(values: ArrayLike<number>, from = 0, to = values.length): { mean: number; sigma: number } {
  const n = to - from;
  let mean = 0;
  for (let i = from; i < to; i++) mean += values[i] / n;
  const r = new Float64Array(n);
  let s0 = 0;
  for (let i = 0; i < n; i++) {
    r[i] = values[from + i] - mean;
    s0 += r[i] * r[i];
  }
  return { mean, sigma: Math.sqrt(s0 / Math.max(n - 1, 1) / n) * ar1Inflation(r) };
}

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
  const { mean, sigma } = meanSigma(part, first.start, first.end);
  return { level: mean, sigma, startIndex: from + first.start, samples: first.end - first.start };
}

/** What the settled level says about the growth after the cut. */
export interface LevelEvidence {
  settled: SettledLevel;
  /** The reading the layer's curve predicts for a growth δ (nm after the last logged sample), for each δ. */
  predict: (deltaNm: ArrayLike<number>) => Float64Array;
  /** 1σ of the settled level against that prediction (the level's σ and the σ of the curve's local misfit). */
  sigma: number;
  /** σ of the prediction per nm of growth: the curve's slope at the end, as uncertain as the last readings' trend against it. */
  sigmaPerNm: number;
}

export interface LevelEvidenceInput {
  settled: SettledLevel;
  optics: MonitorOptics;
  below: readonly LayerAt[];
  index: number;
  extinction: number;
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  /** Time from the layer's start to its last logged sample, s. */
  durationS: number;
  gain: number;
  offset: number;
  /** The layer's last logged readings and their times since the layer's start. */
  lastReadings: ArrayLike<number>;
  lastTauS: ArrayLike<number>;
  /**
   * The least σ a mean of this many readings may have (the run's noise model, fit/idleNoiseModel.ts
   * meanVariance): a floor under the last readings' mean misfit, whose own scatter over a few
   * seconds of correlated noise underestimates it.
   */
  meanSigmaFloor?: (samples: number) => number;
}

/**
 * The settled idle level as evidence on the growth after the cut: the film keeps growing while
 * the shutter closes, and the reading settles where the layer's curve lies at its final
 * thickness. The curve is the fitted one, offset + gain·M(d), continued past the last logged
 * thickness; its own small misfit near the end (the mean residual of the last readings) is
 * carried into the prediction, so only the curve's shape over the last fraction of a nanometre
 * matters. Where the curve is flat (a cut at a turning point) the level changes only to second
 * order in δ and tells little; off an extremum it tells δ to first order.
 */
export function levelEvidence(input: LevelEvidenceInput): LevelEvidence {
  const { optics, below, index, extinction, gain, offset } = input;
  const spec = { ...optics, below, growing: fromNK(index, extinction), pol: 's' as const };
  const k = input.lastReadings.length;
  const d = new Float64Array(k);
  for (let i = 0; i < k; i++) d[i] = thicknessAt(input.lastTauS[i], input.rateNmPerS, input.rateDriftNmPerS2);
  const m = growingLayerSignal(spec, d);
  const residuals = new Float64Array(k);
  for (let i = 0; i < k; i++) residuals[i] = input.lastReadings[i] - (offset + gain * m[i]);
  const own = meanSigma(residuals);
  const floor = input.meanSigmaFloor?.(k) ?? 0;
  const misfit = { mean: own.mean, sigma: Number.isFinite(floor) ? Math.max(own.sigma, floor) : own.sigma };
  const endNm = thicknessAt(input.durationS, input.rateNmPerS, input.rateDriftNmPerS2);
  // The residuals' trend over the last readings (per nm of the curve): a curve whose slope at the
  // end is off (a misfit of the model) would carry that error into the growth; its size and σ
  // bound how far the curve may be continued.
  const trend = lineSlope(d, residuals);
  return {
    settled: input.settled,
    sigma: Math.hypot(input.settled.sigma, misfit.sigma),
    sigmaPerNm: Math.abs(trend.slope) + trend.sigma,
    predict: (deltaNm) => {
      const at = Float64Array.from(deltaNm, (x) => endNm + x);
      const curve = growingLayerSignal(spec, at);
      return curve.map((v) => offset + gain * v + misfit.mean);
    },
  };
}

/** Least-squares slope of y on x and its σ (widened for correlation, ar1Inflation). */
function lineSlope(x: ArrayLike<number>, y: ArrayLike<number>): { slope: number; sigma: number } {
  const n = x.length;
  let mx = 0, my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i] / n;
    my += y[i] / n;
  }
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (!(sxx > 0) || n < 3) return { slope: 0, sigma: 0 };
  const slope = sxy / sxx;
  const r = Float64Array.from({ length: n }, (_, i) => y[i] - my - slope * (x[i] - mx));
  const s2 = r.reduce((a, v) => a + v * v, 0) / (n - 2);
  return { slope, sigma: Math.sqrt(s2 / sxx) * ar1Inflation(r) };
}

/** Readings used for a layer's start level, and the most time they may span, s. */
const START_READINGS = 20;
const START_SPAN_S = 2;

/**
 * The reading at a layer's start: a straight line through its first readings (at most 20, over
 * at most 2 s), taken at the layer's first sample; its σ from the line's residuals, widened for
 * their correlation (ar1Inflation). A line, not a mean, so that a layer that starts
 * on a slope (after a level cut) is read at its start.
 */
export function startLevel(tauS: ArrayLike<number>, readings: ArrayLike<number>): { level: number; sigma: number; samples: number } | null {
  let n = 0;
  while (n < Math.min(START_READINGS, readings.length) && tauS[n] - tauS[0] <= START_SPAN_S) n++;
  if (n < 5) return null;
  let st = 0, sy = 0;
  for (let i = 0; i < n; i++) {
    st += tauS[i] - tauS[0];
    sy += readings[i];
  }
  const tm = st / n, ym = sy / n;
  let stt = 0, sty = 0;
  for (let i = 0; i < n; i++) {
    const t = tauS[i] - tauS[0] - tm;
    stt += t * t;
    sty += t * (readings[i] - ym);
  }
  const slope = stt > 0 ? sty / stt : 0;
  const residuals = Float64Array.from({ length: n }, (_, i) => readings[i] - ym - slope * (tauS[i] - tauS[0] - tm));
  const s2 = residuals.reduce((a, r) => a + r * r, 0) / Math.max(n - 2, 1);
  // The intercept's σ for a straight line, √(s²·(1/n + t̄²/Stt)), widened for correlation.
  const sigma = Math.sqrt(s2 * (1 / n + (stt > 0 ? (tm * tm) / stt : 0))) * ar1Inflation(residuals);
  return { level: ym - slope * tm, sigma, samples: n };
}

/**
 * Whether a layer starts where the one below ended: its start level (startLevel) against the
 * settled idle level after the layer below (same chip). A message naming both layers when they
 * differ by more than 5σ and by more than 0.1 % of full scale, else null. A step between the two
 * means the stack or the detector changed during the pause (a chip change not logged, a lamp
 * step), or the segmentation or chip assignment is wrong.
 */
export function startCheck(layer: number, below: number, settled: SettledLevel, start: { level: number; sigma: number }): string | null {
  const diff = start.level - settled.level;
  const sigma = Math.hypot(settled.sigma, start.sigma);
  if (Math.abs(diff) <= Math.max(5 * sigma, 0.001)) return null;
  return `layer ${layer} starts at a reading of ${start.level.toFixed(4)}, but the reading settled at ${settled.level.toFixed(4)} after layer ${below} ` +
    `(a step of ${(diff * 100).toFixed(2)} % of full scale, ${(Math.abs(diff) / sigma).toFixed(0)}σ): the layer does not start where the one below ended ` +
    '(the stack or the detector changed during the pause, or the segmentation or chip assignment is wrong)';
}
