import { fitAr1PlusWhite } from '../stats';
import { levelSteps, longRunSigma, meanSigma, median, noiseSigma, type Level } from '../trace';

export interface ChipCalibration {
  chip: number;
  /** Detector reading per unit of modelled signal. */
  gain: number;
  /**
   * 1σ of the gain from the noise of the bare-chip samples it came from (the σ of their median,
   * correlated noise included: medianSigma); the offset's σ is not in it.
   */
  gainSigma: number;
  /** Detector reading with no light from the chip (dark level, or stray light fitted). */
  offset: number;
  /** 1σ of the offset (0 when it was assumed, not measured). */
  offsetSigma: number;
  /**
   * 'dark': from dark samples just before the bare chip; 'fitted': from the chip's layers (no
   * dark samples); 'averaged': that fit averaged with the offset assumed (fit/offsetAveraging.ts); 'earlier-chip': an earlier chip's; 'other-chips': the median of the other
   * chips' dark readings (this chip's own was missing or disagreed); 'assumed': 0, nothing better known.
   */
  offsetSource: 'dark' | 'fitted' | 'averaged' | 'earlier-chip' | 'other-chips' | 'assumed';
  /** An averaged offset (fit/offsetAveraging.ts): the weight of the fitted one against the one assumed. */
  offsetWeight?: number;
  /** 'bare-chip': from the idle stretch before the chip's first layer; 'first-layer': from the first layer's start. */
  source: 'bare-chip' | 'first-layer';
  bareSamples: number;
  darkSamples: number;
  /** Samples of the idle stretch left out as the previous chip's level or a transient. */
  otherSamples: number;
  /** White-noise σ of the reading, detector units. */
  noiseSigma: number;
  /** Bare-chip reading (median of the bare stretch), detector units; null from a first layer. */
  bareLevel: number | null;
  /**
   * With a fitted offset: σ of the gain as the chip's layers and its bare reading tell it
   * together (fit/chipOffset.ts, the gain free under the bare reading's prior), the offset's σ in it.
   */
  layerGainSigma?: number;
  /** Refit mode with a chip-wide gain: the gain at the chip's first layer start, refined by the joint fit. */
  refinedGain?: number;
  refinedGainSigma?: number;
  /** …and its drift, fraction per hour. */
  gainDriftPerHour?: number;
  gainDriftSigmaPerHour?: number;
}

export interface CalibrationInput {
  chip: number;
  /** Readings of the idle stretch before the chip's first layer (may be empty). */
  idleSignal: ArrayLike<number>;
  /** Readings of the first few seconds of the chip's first layer (fallback). */
  firstLayerSignal: ArrayLike<number>;
  /** The model's signal (fraction) of the chip as it is before its first layer (bare chip). */
  modelledBare: number;
  /** The detector's offset known from an earlier chip, used when this stretch has no dark samples. */
  knownOffset?: number;
  /**
   * The reading expected from the previous chip's finished stack (design stack, its calibration),
   * when this chip replaced another: a low level near it is that chip, not a dark reading.
   */
  previousChipLevel?: number;
  /** The trace's logging interval, s (the noise's correlation is read over seconds, not samples: trace/levelSteps ar1Noise). */
  sampleS?: number;
}

/** A level counts as dark below this fraction of the bare chip's reading. */
const DARK_FRACTION = 0.3;
/**
 * Below this fraction of the bare chip's reading (and not dark), a steady level before a run's
 * first chip is reported (lowLevelNotDark): a lamp warming up or a holder moving in stays above
 * it; a detector whose offset is a large part of its reading puts its dark reading there.
 */
const UNREAD_DARK_FRACTION = 0.7;

/** What calibrateChip read, and a steady low level before a first chip it did not take as dark. */
export type ChipCalibrationReading = ChipCalibration & {
  /** Mean of that level (detector units), where one was seen; calibrateChips warns and drops it. */
  lowLevelNotDark?: number;
};

/**
 * Gain and offset of the detector for one chip from the idle stretch before its first layer,
 * read as a sequence of levels (levelSteps): the last long level before the layer is the bare
 * new chip; the bottom of a dip far below it (under 30 % of it) is the dark reading while the chips were
 * exchanged (darkLevels); anything else (the previous chip's last level, the end of its last
 * layer, the dip's sides) is not this chip's and is left out.
 */
export function calibrateChip(input: CalibrationInput): ChipCalibrationReading {
  const idle = Float64Array.from(input.idleSignal);
  const { chip, modelledBare } = input;
  const fallbackOffset = input.knownOffset ?? 0;
  const offsetSource = input.knownOffset === undefined ? 'assumed' : 'earlier-chip';
  if (idle.length >= 10) {
    const sigma = longRunSigma(idle, input.sampleS);
    const levels = levelSteps(idle, { sigma, minLength: 5 });
    // The bare chip's stretch: the last long level, extended back over levels at the same reading
    // (lamp drift and slow noise split a long stretch).
    const last = bareLevelIndex(levels);
    const same = Math.max(5 * sigma, 0.003 * Math.abs(levels[last].mean));
    let first = last;
    while (first > 0 && Math.abs(levels[first - 1].mean - levels[last].mean) < same) first--;
    const bare = { start: levels[first].start, end: levels[last].end, mean: levels[last].mean };
    const bareCount = bare.end - bare.start;
    if (bareCount >= 5 && bare.mean > 0) {
      const dark = darkLevels(idle, levels.slice(0, first + 1), noiseSigma(idle.subarray(bare.start, bare.end)), input);
      const darkCount = dark.reduce((a, l) => a + l.end - l.start, 0);
      const offset = dark.length ? dark.reduce((a, l) => a + l.mean * (l.end - l.start), 0) / darkCount : fallbackOffset;
      const bareSignal = idle.subarray(bare.start, bare.end);
      const bareLevel = median(bareSignal);
      const s = noiseSigma(bareSignal);
      // σ of the short dark mean and of the bare mean from the bare stretch's noise (correlated
      // noise does not average away over a dip shorter than its correlation time).
      const noise = bareNoise(bareSignal, input.sampleS);
      // A run's first chip (no chip before it) with no dark level: a steady level far below the bare
      // chip may still be the dark reading of a detector with a large offset; said, not taken.
      const low = dark.length || input.previousChipLevel !== undefined || input.knownOffset !== undefined ? null
        : lowestSteadyLevel(levels.slice(0, first), bareLevel, 20 * s);
      return {
        ...(low ? { lowLevelNotDark: low.mean } : {}),
        chip, gain: (bareLevel - offset) / modelledBare, offset, offsetSource: dark.length ? 'dark' : offsetSource,
        offsetSigma: dark.length ? whiteAr1MeanSigma(bareSignal, noise, darkCount, input.sampleS) : 0,
        gainSigma: medianSigma(bareSignal, noise, s, input.sampleS) / modelledBare, source: 'bare-chip',
        bareSamples: bareCount, darkSamples: darkCount, otherSamples: idle.length - bareCount - darkCount, noiseSigma: s, bareLevel,
      };
    }
  }
  const first = Float64Array.from(input.firstLayerSignal);
  if (first.length === 0) throw new RangeError(`chip ${chip}: no samples to calibrate the gain from`);
  return {
    chip, gain: (median(first) - fallbackOffset) / modelledBare, offset: fallbackOffset, offsetSigma: 0, offsetSource, source: 'first-layer',
    gainSigma: (1.2533 * noiseSigma(first)) / Math.sqrt(first.length) / modelledBare,
    bareSamples: 0, darkSamples: 0, otherSamples: idle.length, noiseSigma: noiseSigma(first), bareLevel: null,
  };
}

/**
 * σ of the median of a stretch: the σ of its mean (meanSigma, correlated noise included) plus the
 * median's extra variance on the white part, (π/2 − 1)·σ²/N (the median's asymptotic variance
 * πσ²/(2N) for normal samples; from memory).
 */
function medianSigma(y: Float64Array, noise: StretchNoise | null, white: number, sampleS?: number): number {
  return Math.sqrt(whiteAr1MeanSigma(y, noise, y.length, sampleS) ** 2 + ((Math.PI / 2 - 1) * white * white) / y.length);
}

/** The variogram's lags for the bare stretch's noise, s: two or three of a lock-in's correlation times. */
const NOISE_LAG_S = 2.5;
/** The noise is read on means of this many seconds' samples at most (one sample at 10 Hz and slower). */
const NOISE_BIN_S = 0.1;

/** White + AR(1) noise of a stretch (see bareNoise), on means of k samples: the white part per sample. */
interface StretchNoise {
  k: number;
  whitePerSample: number;
  ar1Var: number;
  rho: number;
}

/**
 * The bare stretch's noise, white plus AR(1), from the robust variogram over 2.5 s (stats
 * fitAr1PlusWhite) of its means of k samples, k the samples in 0.1 s (1 at 10 Hz and slower): on
 * an 86 Hz trace the variogram of every sample to 2.5 s cost 0.15 s of a 1.8 s analysis, the
 * means of 8 a sixtieth of it. A mean of k samples keeps the AR(1) part (k samples are a tenth of
 * its correlation time) and divides the white part by k.
 */
function bareNoise(y: Float64Array, sampleS?: number): StretchNoise | null {
  const k = sampleS && sampleS > 0 ? Math.max(1, Math.floor(NOISE_BIN_S / sampleS + 1e-9)) : 1;
  const n = Math.floor(y.length / k);
  if (n < 4 * 8) return null;
  const means = new Float64Array(n);
  for (let b = 0; b < n; b++) {
    let sum = 0;
    for (let i = b * k; i < (b + 1) * k; i++) sum += y[i];
    means[b] = sum / k;
  }
  const maxLag = sampleS && sampleS > 0 ? Math.max(8, Math.round(NOISE_LAG_S / (k * sampleS))) : 25;
  const { whiteVar, ar1Var, rho } = fitAr1PlusWhite(means, maxLag);
  return { k, whitePerSample: whiteVar * k, ar1Var, rho };
}

/**
 * σ of the mean of m consecutive samples under the stretch's noise (bareNoise): σ_w²/m +
 * (σ_x²/m')·[1 + 2·Σ_{j=1}^{m'−1} (1 − j/m')·ρ^j], m' = m/k of its means (the variance of a
 * stationary series' mean, G. E. P. Box and G. M. Jenkins, "Time Series Analysis"; from memory),
 * never below trace/meanSigma's. Read as AR(1) alone (meanSigma), the white part's share of the
 * first differences takes the correlation for a short one: on an 86 Hz trace a 0.5 s dark dip's
 * mean came out at ±0.00006 for a lock-in's noise of 0.0006 correlated over 1 s, which hardly
 * averages over the dip.
 */
function whiteAr1MeanSigma(y: Float64Array, noise: StretchNoise | null, m: number, sampleS?: number): number {
  const floor = meanSigma(y, m, sampleS);
  if (!noise) return floor;
  const count = Math.max(1, m / noise.k);
  let sum = 1;
  for (let j = 1, rj = noise.rho; j < count && rj > 1e-12; j++, rj *= noise.rho) sum += 2 * (1 - j / count) * rj;
  return Math.max(floor, Math.sqrt(noise.whitePerSample / Math.max(1, m) + (noise.ar1Var / count) * sum));
}

/** Samples a level needs to be taken as the bare chip (2 s at 10 Hz) when there is a choice. */
const MIN_BARE = 20;

/**
 * The bare chip's level: the last one of at least MIN_BARE samples (or a quarter of the stretch),
 * so that a short trailing step (the layer's first growth, when its start is placed late) is not
 * taken for it; else the longest.
 */
function bareLevelIndex(levels: readonly Level[]): number {
  const total = levels[levels.length - 1].end - levels[0].start;
  const need = Math.min(MIN_BARE, Math.ceil(total / 4));
  for (let i = levels.length - 1; i >= 0; i--) if (levels[i].end - levels[i].start >= need) return i;
  let longest = 0;
  levels.forEach((l, i) => { if (l.end - l.start > levels[longest].end - levels[longest].start) longest = i; });
  return longest;
}

/** The lowest level of at least 10 samples between DARK_FRACTION and UNREAD_DARK_FRACTION of the bare reading, `gap` below it. */
function lowestSteadyLevel(levels: readonly Level[], bare: number, gap: number): Level | null {
  let low: Level | null = null;
  for (const l of levels) {
    if (l.end - l.start < 10 || l.mean >= UNREAD_DARK_FRACTION * bare || l.mean < DARK_FRACTION * bare || bare - l.mean < gap) continue;
    if (!low || l.mean < low.mean) low = l;
  }
  return low;
}

/**
 * The dark reading before the bare chip: while the chips are exchanged the holder blocks the
 * beam for a moment, a dip between the previous chip's level and the bare chip's, with sloping
 * sides. The lowest level far below the bare chip (under 30 % of it) is that dip, unless it sits
 * nearer the previous chip's expected reading than the known offset; the dip is split again
 * finely and its flat bottom (the lowest level of at least 3 samples) is the dark reading.
 */
function darkLevels(idle: Float64Array, levels: readonly Level[], sigma: number, input: CalibrationInput): Level[] {
  const bare = levels[levels.length - 1].mean;
  let lowest: Level | null = null;
  for (const l of levels.slice(0, -1)) if (l.mean < DARK_FRACTION * bare && (!lowest || l.mean < lowest.mean)) lowest = l;
  if (!lowest) return [];
  if (input.previousChipLevel !== undefined) {
    const ref = input.knownOffset ?? 0;
    if (Math.abs(lowest.mean - input.previousChipLevel) < Math.abs(lowest.mean - ref)) return [];
  }
  const from = Math.max(0, lowest.start - 3), to = Math.min(idle.length, lowest.end + 3);
  const fine = levelSteps(idle.subarray(from, to), { sigma, minLength: 3 });
  let bottom: Level | null = null;
  for (const l of fine) if (l.end - l.start >= 3 && (!bottom || l.mean < bottom.mean)) bottom = l;
  return bottom ? [flatBottom(idle, from + bottom.start, from + bottom.end, sigma)] : [];
}

/**
 * The flat part of a dip's bottom level [a, b): binary segmentation splits greedily and keeps
 * every level ≥ 3 samples, so a sample of a sloping side can stay in the bottom when the flat
 * bottom is short (the holder's dark moment, 4–6 samples at 10 Hz: chamber mirror, seed 28,
 * bottom [0.104, 0.003, 0.003, 0.003] read as a dark level 0.028 for a true 0.003; at 1 Hz two or
 * three: [0.104, 0.003, 0.004, 0.314]). Samples at its ends more than 5σ above its lowest are left
 * out (the dip's sides rise from it; a flat sample lies that far above the lowest of a few only
 * past about 3σ of its own), keeping at least one. Measured from the level's median instead,
 * the 1 Hz bottom above (an even count: the median halfway up a side) kept a side and read 0.16.
 */
export function flatBottom(y: ArrayLike<number>, a: number, b: number, sigma: number): Level {
  let low = Infinity;
  for (let i = a; i < b; i++) low = Math.min(low, y[i]);
  const off = (i: number) => y[i] - low > 5 * sigma;
  while (b - a > 1 && off(a)) a++;
  while (b - a > 1 && off(b - 1)) b--;
  let sum = 0;
  for (let i = a; i < b; i++) sum += y[i];
  return { start: a, end: b, mean: sum / (b - a) };
}
