import { addStretchSums, fitLongVariogram, newLongVariogram, stretchSums, whitenAr1PlusWhite, type Ar1PlusWhite } from '../stats';
import { levelSteps, type TraceData } from '../trace';
import { hampelFilter } from '../trace/hampelFilter';
import { medianInPlace } from '../trace/robustStats';

/** Flat stretches shorter than this add too few lags to the variogram. */
const MIN_STEP_SAMPLES = 12;
/**
 * The most samples read from one step, and in all: a step's lags reach half its length (40 s at
 * 100 samples/s, many times a lock-in's correlation time), and 60 000 pooled samples put the
 * sill's scatter near a few % for a correlation of 1 s; beyond that reading more only costs time.
 */
const MAX_STEP_SAMPLES = 4000;
const MAX_SAMPLES = 60_000;
/** …and from at most this many steps. */
const MAX_STEPS = 40;
/** The longest lag read: half the longest step. */
const MAX_LAG = MAX_STEP_SAMPLES / 2;
/**
 * A step whose mean squared first difference exceeds the steps' median by this factor is not
 * noise about a level (a dark transient, a level still settling): for Gaussian noise the mean of
 * ≥ 11 squared differences passes 4× its expectation with a probability near 10⁻⁵ (χ²₁₁/11;
 * common practice for the margin).
 */
const ROUGH_FACTOR = 4;
/** Steps below this fraction of their idle stretch's upper level are dark (as analyzeRun's idleNoise). */
const DARK_FRACTION = 0.3;

/**
 * The detector's white + AR(1) noise from the run's idle stretches: each split into its level
 * steps (old chip, dark, bare chip, a settled layer) so that no step reads as noise, dark steps
 * left out (the lamp's noise is not in them), spikes taken out (trace/hampelFilter), steps that
 * are not noise about a level dropped (ROUGH_FACTOR), and every step's variogram pooled at every
 * lag up to half its length (stats/longVariogram: no bias from a step's unknown level, so the
 * short steps between layers and the long bare-chip ones add up), fitted by Cressie's weighted
 * least squares. Null when no step is long enough.
 */
export function idleNoiseModel(trace: TraceData, idle: readonly { startIndex: number; endIndex: number }[]): Ar1PlusWhite | null {
  // The steps are found with the noise's long-run σ as their penalty's scale; each stretch's own
  // reading of it (trace/longRunSigma, lags up to 25 samples) is short for a slow noise sampled
  // fast and cuts the noise's own wander into "levels", which hides the long lags. So the steps
  // are found again with the pooled model's long-run σ until it settles (a real level change,
  // a chip's or the lamp's, is far beyond it).
  // Spikes out once, before the steps are sought (a spike is no level either).
  const stretches = idle.filter((s) => s.endIndex - s.startIndex >= MIN_STEP_SAMPLES).map((s) => hampelFilter(trace.signal.subarray(s.startIndex, s.endIndex)));
  // each stretch's 90th percentile, the dark steps' yardstick: the same in every pass
  const uppers = stretches.map((part) => {
    const sorted = Float64Array.from(part).sort();
    return sorted[Math.floor(0.9 * (sorted.length - 1))];
  });
  // each step's variogram sums, by stretch and place: a step found again in a later pass is not read again
  const known = new Map<string, Float64Array>();
  let pooled = pooledModel(stretches, uppers, undefined, known);
  for (let pass = 0; pass < PASSES && pooled.fit; pass++) {
    const next = pooledModel(stretches, uppers, pooled.fit.longRunSigma, known);
    if (!next.fit) break;
    const settled = Math.abs(next.fit.longRunSigma / pooled.fit.longRunSigma - 1) < 0.05;
    pooled = next;
    if (settled) break;
  }
  const { fit, steps } = pooled;
  return fit && fit.ar1Var > 0 ? keptIfTold(fit, steps) : fit;
}

/** More passes of the step search with the pooled long-run σ (see idleNoiseModel). */
const PASSES = 3;

/** The steps' pooled variogram fit, and the steps it read. */
function pooledModel(
  stretches: readonly Float64Array[], uppers: readonly number[], sigma: number | undefined, known: Map<string, Float64Array>,
): { fit: Ar1PlusWhite | null; steps: Float64Array[] } {
  const steps: Float64Array[] = [], places: string[] = [];
  let read = 0;
  reading: for (const [j, part] of stretches.entries()) {
    const upper = uppers[j];
    for (const step of levelSteps(part, { minLength: MIN_STEP_SAMPLES, ...(sigma ? { sigma } : {}) })) {
      if (step.end - step.start < MIN_STEP_SAMPLES || step.mean < DARK_FRACTION * upper) continue;
      const end = Math.min(step.end, step.start + MAX_STEP_SAMPLES);
      steps.push(part.subarray(step.start, end));
      places.push(`${j} ${step.start} ${end}`);
      read += end - step.start;
      if (read >= MAX_SAMPLES || steps.length >= MAX_STEPS) break reading;
    }
  }
  if (steps.length === 0) return { fit: null, steps };
  const rough = steps.map(meanSquaredDifference);
  const typical = medianInPlace(Float64Array.from(rough));
  const keep = (_: unknown, j: number) => !(rough[j] > ROUGH_FACTOR * typical);
  const kept = steps.filter(keep);
  return { fit: fitPool(kept, places.filter(keep), known), steps: kept };
}

/** The steps' pooled variogram (stats/longVariogram: addToLongVariogram's sums, each step's read once a run), fitted. */
function fitPool(steps: readonly Float64Array[], places: readonly string[], known: Map<string, Float64Array>): Ar1PlusWhite | null {
  const pool = newLongVariogram(MAX_LAG);
  steps.forEach((y, j) => {
    let sums = known.get(places[j]);
    if (!sums) known.set(places[j], (sums = stretchSums(y, pool)));
    addStretchSums(sums, y.length, pool);
  });
  return fitLongVariogram(pool);
}

/**
 * The AR(1) part only where the steps tell it: the Gaussian log-likelihood of every step about its
 * mean under the fitted white + AR(1) noise (the Kalman innovations, stats/whitenAr1PlusWhite)
 * against white noise of the same variance must gain more than χ²₂'s 0.1 % point, 13.8/2
 * (Wilks' likelihood-ratio test; from memory; both models at the variogram's values, not at their
 * own maxima, so the test is approximate). The variogram's long lags rest on the few long steps;
 * their scatter alone reads as a slow part in white noise (σ_x 3–4e-4, τ 2–8 s from 0.1 % white
 * noise on the synthetic mirror), which the layer-start check's level floors (meanVariance) and
 * anything reading the model's correlation would take for a real one.
 */
function keptIfTold(fit: Ar1PlusWhite, steps: readonly Float64Array[]): Ar1PlusWhite {
  const total = fit.whiteVar + fit.ar1Var;
  let gain = 0;
  for (const y of steps) {
    let mean = 0;
    for (let i = 0; i < y.length; i++) mean += y[i];
    mean /= y.length;
    const e = Float64Array.from(y, (v) => v - mean);
    let white = 0;
    for (let i = 0; i < e.length; i++) white += (e[i] * e[i]) / total;
    const w = Float64Array.from(e);
    whitenAr1PlusWhite(fit, [w]);
    // −2·log L = Σ v_i²/F_i + Σ log F_i: the standardised innovations' squares, and the log-variances
    let ar = 0;
    for (let i = 0; i < w.length; i++) ar += w[i] * w[i];
    gain += (white - ar) / 2 + logDetGain(fit, e.length);
  }
  return gain > 13.8 / 2 ? fit : { whiteVar: total, ar1Var: 0, rho: 0, longRunSigma: Math.sqrt(total) };
}

/** ½·[n·log(σ_w² + σ_x²) − Σ log F_i]: the log-determinant part of the likelihood gain, F_i the Kalman innovations' variances (as in whitenAr1PlusWhite). */
function logDetGain(noise: Ar1PlusWhite, n: number): number {
  const { whiteVar: R, ar1Var, rho } = noise;
  const q = ar1Var * (1 - rho * rho);
  let P = ar1Var, s = 0;
  for (let i = 0; i < n; i++) {
    const Pm = i === 0 ? P : rho * rho * P + q;
    const F = Pm + R;
    s += Math.log(F);
    P = F > 0 ? (R * Pm) / F : 0;
  }
  return (n * Math.log(R + ar1Var) - s) / 2;
}

function meanSquaredDifference(y: Float64Array): number {
  let s = 0;
  for (let i = 1; i < y.length; i++) s += (y[i] - y[i - 1]) ** 2;
  return s / (y.length - 1);
}

/**
 * Variance of the mean of m consecutive samples of white + AR(1) noise:
 * σ_w²/m + σ_x²·[m + 2·Σ_{k=1}^{m−1} (m − k)·ρ^k]/m² (the variance of a sample mean of a
 * stationary series, G. E. P. Box, G. M. Jenkins, "Time Series Analysis", Holden-Day (1970), with
 * the AR(1) autocorrelation ρ^k).
 */
export function meanVariance(noise: Ar1PlusWhite, m: number): number {
  if (!(m >= 1)) return NaN;
  let s = m;
  let r = 1;
  for (let k = 1; k < m; k++) {
    r *= noise.rho;
    s += 2 * (m - k) * r;
  }
  return noise.whiteVar / m + (noise.ar1Var * s) / (m * m);
}

/** The stretches between consecutive layers (sorted by start), and before the first: the pauses of a run whose layers were placed. */
export function gapsBetween(layers: readonly { startIndex: number; endIndex: number }[]): { startIndex: number; endIndex: number }[] {
  const sorted = [...layers].sort((a, b) => a.startIndex - b.startIndex);
  const gaps: { startIndex: number; endIndex: number }[] = [];
  let from = 0;
  for (const l of sorted) {
    if (l.startIndex > from) gaps.push({ startIndex: from, endIndex: l.startIndex });
    from = Math.max(from, l.endIndex);
  }
  return gaps;
}
