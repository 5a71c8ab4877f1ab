import { medianInPlace, noiseSigma } from './robustStats';

/** A stretch of samples at one level, [start, end) within the series given. */
export interface Level {
  start: number;
  /** Exclusive. */
  end: number;
  mean: number;
}

export interface LevelStepOptions {
  /**
   * Noise σ for the penalty, held. When absent: the long-run σ of the series (longRunSigma), so
   * that correlated noise (a lock-in, a rotating holder) does not read as steps.
   */
  sigma?: number;
  /**
   * Penalty per change point, in units of σ²·ln n. 2 is the Schwarz (BIC) choice for a mean
   * shift of known σ; the default is larger for margin against spikes and slow wander. @default 6
   */
  penalty?: number;
  /** Fewest samples in a level. @default 5 */
  minLength?: number;
  /** Adjacent levels closer than this (absolute) are merged after the search. @default 0 */
  mergeBelow?: number;
  /** The series' sampling interval, s, for the default σ (longRunSigma). */
  sampleS?: number;
}

/**
 * Piecewise-constant levels of a series by binary segmentation (A. J. Scott and M. Knott,
 * Biometrics 30, 507–512 (1974); the penalised-cost form as reviewed by R. Killick, P. Fearnhead
 * and I. A. Eckley, "Optimal detection of changepoints with a linear computational cost",
 * J. Am. Stat. Assoc. 107, 1590–1598 (2012)): the split that lowers the squared-error cost most
 * is kept while the gain exceeds penalty·σ²·ln n, recursively on both sides. A ramp (a layer
 * still growing after the logged cut) comes out as a staircase of short levels.
 */
export function levelSteps(y: ArrayLike<number>, options: LevelStepOptions = {}): Level[] {
  return search(y, options.sigma ?? longRunSigma(y, options.sampleS), options);
}

/**
 * Long-run σ of the noise (σ of a mean of m samples is this over √m) for an AR(1) model,
 * σ²·(1 + ρ)/(1 − ρ) (G. E. P. Box, G. M. Jenkins, Time Series Analysis, the AR(1) process;
 * from memory), from robust scales that a few level steps do not disturb: σ² from the MAD of
 * differences at a lag beyond the correlation (Var(y[i+k] − y[i]) → 2σ²), ρ from the MAD of
 * first differences (Var = 2σ²(1 − ρ)). Never below the white σ of second differences.
 */
export function longRunSigma(y: ArrayLike<number>, sampleS?: number): number {
  const ar = ar1Noise(y, sampleS);
  if (!ar) return noiseSigma(y);
  return Math.max(noiseSigma(y), Math.sqrt(ar.variance * ((1 + ar.rho) / (1 - ar.rho))));
}

/**
 * σ of the mean of m consecutive samples with the noise of `y` (AR(1), as longRunSigma):
 * Var = (σ²/m)·[1 + 2·Σ_{k=1}^{m−1} (1 − k/m)·ρ^k] (Box and Jenkins, the variance of a sample
 * mean of a stationary series; from memory). For m much shorter than the correlation this stays
 * near σ (a short dark dip under a lock-in's slow noise averages nothing away); for m much
 * longer it tends to longRunSigma/√m. Never below the white σ over √m.
 */
export function meanSigma(y: ArrayLike<number>, m: number, sampleS?: number): number {
  const count = Math.max(1, Math.floor(m));
  const white = noiseSigma(y) / Math.sqrt(count);
  const ar = ar1Noise(y, sampleS);
  if (!ar) return white;
  let sum = 1;
  for (let k = 1, rk = ar.rho; k < count; k++, rk *= ar.rho) sum += 2 * (1 - k / count) * rk;
  return Math.max(white, Math.sqrt((ar.variance / count) * sum));
}

/** The lag of ar1Noise's variance, s: two or three correlation times of a lock-in (about 1 s). */
const AR_LAG_S = 2.5;
/** Samples of that lag at 10 Hz and slower, and the cap on ρ there. */
const AR_LAG_SAMPLES = 25;
const AR_RHO_CAP = 0.98;

/**
 * Robust σ² and lag-1 correlation ρ of an AR(1) noise (see longRunSigma); null for short series.
 * The lag is 25 samples, or 2.5 s where the series is sampled faster than 10 Hz (sampleS given):
 * 25 samples of an 86 Hz trace are 0.3 s, which a lock-in's 1 s correlation hardly reaches, so its
 * variance was read low (the bench's 40-layer run: a 0.5 s dark dip's mean at ±0.00006 for an
 * error of 0.0003, every index above its truth, 7 of 40 beyond 3σ); ρ's cap goes with the lag, the
 * same correlation time at any rate.
 */
function ar1Noise(y: ArrayLike<number>, sampleS?: number): { variance: number; rho: number } | null {
  const n = y.length;
  if (n < 40) return null;
  // Two or three correlation times, few enough to keep steps rare among the differences.
  const perLag = sampleS && sampleS > 0 ? Math.max(AR_LAG_SAMPLES, Math.round(AR_LAG_S / sampleS)) : AR_LAG_SAMPLES;
  const lag = Math.min(perLag, Math.floor(n / 8));
  const mad = (k: number) => {
    const d = new Float64Array(n - k);
    for (let i = 0; i + k < n; i++) d[i] = y[i + k] - y[i];
    const m = medianInPlace(d);
    for (let i = 0; i < d.length; i++) d[i] = Math.abs(d[i] - m);
    return 1.4826 * medianInPlace(d);
  };
  const total2 = mad(lag) ** 2 / 2;
  const first2 = mad(1) ** 2;
  if (!(total2 > 0)) return null;
  return { variance: total2, rho: Math.min(Math.max(1 - first2 / (2 * total2), 0), AR_RHO_CAP ** (AR_LAG_SAMPLES / perLag)) };
}

function search(y: ArrayLike<number>, sigma: number, options: LevelStepOptions): Level[] {
  const n = y.length;
  if (n === 0) return [];
  const minLength = Math.max(1, options.minLength ?? 5);
  const { cs, cs2 } = prefixSums(y);
  // A floor on σ keeps a noiseless series from splitting at rounding error.
  const scale = Math.max(sigma, 1e-9 * (Math.abs(cs[n] / n) + 1));
  const beta = (options.penalty ?? 6) * scale * scale * Math.log(Math.max(n, 3));
  const cuts: number[] = [];
  const stack: [number, number][] = [[0, n]];
  while (stack.length) {
    const [a, b] = stack.pop()!;
    if (b - a < 2 * minLength) continue;
    const best = bestSplit(cs, cs2, a, b, minLength, beta);
    if (best < 0) continue;
    cuts.push(best);
    stack.push([a, best], [best, b]);
  }
  cuts.sort((p, q) => p - q);
  const bounds = [0, ...cuts, n];
  let levels: Level[] = [];
  for (let i = 0; i + 1 < bounds.length; i++) {
    const [a, b] = [bounds[i], bounds[i + 1]];
    levels.push({ start: a, end: b, mean: (cs[b] - cs[a]) / (b - a) });
  }
  const merge = options.mergeBelow ?? 0;
  if (merge > 0) {
    const out: Level[] = [];
    for (const l of levels) {
      const last = out[out.length - 1];
      if (last && Math.abs(last.mean - l.mean) < merge) {
        last.mean = (cs[l.end] - cs[last.start]) / (l.end - last.start);
        last.end = l.end;
      } else out.push({ ...l });
    }
    levels = out;
  }
  return levels;
}

// The loops sit in small functions of their own, so the engine optimises each apart from the
// search (which is called on series of several kinds).

function prefixSums(y: ArrayLike<number>): { cs: Float64Array; cs2: Float64Array } {
  const n = y.length;
  const cs = new Float64Array(n + 1), cs2 = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    cs[i + 1] = cs[i] + y[i];
    cs2[i + 1] = cs2[i] + y[i] * y[i];
  }
  return { cs, cs2 };
}

/** Squared-error cost of one level over [a, b). */
function segmentCost(cs: Float64Array, cs2: Float64Array, a: number, b: number): number {
  return cs2[b] - cs2[a] - (cs[b] - cs[a]) ** 2 / (b - a);
}

/** The split of [a, b) that lowers the cost by more than beta and most; −1 when none does. */
function bestSplit(cs: Float64Array, cs2: Float64Array, a: number, b: number, minLength: number, beta: number): number {
  const whole = segmentCost(cs, cs2, a, b);
  let best = -1, bestGain = beta;
  for (let c = a + minLength; c <= b - minLength; c++) {
    const gain = whole - segmentCost(cs, cs2, a, c) - segmentCost(cs, cs2, c, b);
    if (gain > bestGain) {
      best = c;
      bestGain = gain;
    }
  }
  return best;
}
