import { median, noiseSigma } from '../trace';

export interface ChipCalibration {
  chip: number;
  /** Detector reading per unit of modelled signal. */
  gain: number;
  /** 1σ of the gain from the noise of the samples it came from (median: √(π/2)·σ/√N). */
  gainSigma: number;
  /** Detector reading with no light (from dark samples, else an earlier chip's, else 0). */
  offset: number;
  /** 'bare-chip': from the idle stretch before the chip's first layer; 'first-layer': from the first layer's start. */
  source: 'bare-chip' | 'first-layer';
  bareSamples: number;
  darkSamples: number;
  /** White-noise σ of the reading, detector units. */
  noiseSigma: number;
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
  /** The detector's offset known from an earlier chip, used when this stretch has no dark samples. @default 0 */
  knownOffset?: number;
}

/**
 * Gain and offset of the detector for one chip. Idle samples far below the stretch's upper
 * level (below 30 % of its 90th percentile) are taken as dark readings (lamp or shutter off)
 * and give the offset; the rest give the gain against the modelled bare-chip signal.
 */
export function calibrateChip(input: CalibrationInput): ChipCalibration {
  const idle = Float64Array.from(input.idleSignal);
  const { chip, modelledBare } = input;
  if (idle.length >= 5) {
    const sorted = Float64Array.from(idle).sort();
    const upper = sorted[Math.floor(0.9 * (sorted.length - 1))];
    const dark: number[] = [], bare: number[] = [];
    for (const v of idle) (v < 0.3 * upper ? dark : bare).push(v);
    const offset = dark.length >= 5 ? dark.reduce((a, b) => a + b, 0) / dark.length : (input.knownOffset ?? 0);
    if (bare.length >= 5) {
      return {
        chip, gain: (median(bare) - offset) / modelledBare, offset, source: 'bare-chip',
        gainSigma: (1.2533 * noiseSigma(bare)) / Math.sqrt(bare.length) / modelledBare,
        bareSamples: bare.length, darkSamples: dark.length >= 5 ? dark.length : 0, noiseSigma: noiseSigma(bare),
      };
    }
  }
  const first = Float64Array.from(input.firstLayerSignal);
  if (first.length === 0) throw new RangeError(`chip ${chip}: no samples to calibrate the gain from`);
  return {
    chip, gain: (median(first) - (input.knownOffset ?? 0)) / modelledBare, offset: input.knownOffset ?? 0, source: 'first-layer',
    gainSigma: (1.2533 * noiseSigma(first)) / Math.sqrt(first.length) / modelledBare,
    bareSamples: 0, darkSamples: 0, noiseSigma: noiseSigma(first),
  };
}
