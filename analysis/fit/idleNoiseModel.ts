import { addToVariogramPool, fitPooledVariogram, newVariogramPool, type Ar1PlusWhite } from '../stats';
import { levelSteps, type TraceData } from '../trace';

/** Flat stretches shorter than this add too few lags to the variogram. */
const MIN_STEP_SAMPLES = 12;
/**
 * The most samples read from one step, and in all: the variogram's lags reach 40 samples, and
 * 20 000 pooled samples put its scatter near 1 %; beyond that, reading more (a long bare-chip
 * stretch at 100 samples/s) only costs time.
 */
const MAX_STEP_SAMPLES = 1000;
const MAX_SAMPLES = 20_000;
/** …and from at most this many steps. */
const MAX_STEPS = 12;

/**
 * The detector's white + AR(1) noise (stats/fitAr1PlusWhite) from the run's idle stretches: each
 * split into its level steps (old chip, dark, bare chip, a settled layer) so that no step reads as
 * noise, every step's variogram pooled. Null when no step is long enough.
 */
export function idleNoiseModel(trace: TraceData, idle: readonly { startIndex: number; endIndex: number }[]): Ar1PlusWhite | null {
  const pool = newVariogramPool();
  // Every step's variogram into the pool, one fit at the end (fitAr1PlusWhite's after the last step).
  let lags: number[] | null = null;
  let read = 0, steps = 0;
  reading: for (const s of idle) {
    const part = trace.signal.subarray(s.startIndex, s.endIndex);
    if (part.length < MIN_STEP_SAMPLES) continue;
    for (const step of levelSteps(part, { minLength: MIN_STEP_SAMPLES })) {
      if (step.end - step.start < MIN_STEP_SAMPLES) continue;
      const end = Math.min(step.end, step.start + MAX_STEP_SAMPLES);
      lags = addToVariogramPool(part.subarray(step.start, end), 40, pool);
      read += end - step.start;
      if (read >= MAX_SAMPLES || ++steps >= MAX_STEPS) break reading;
    }
  }
  return lags ? fitPooledVariogram(lags, pool) : null;
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
