import { type Design } from '../design';

/** A change of deposition rate inside one layer. */
export interface RateSpike {
  layer: number;
  /** Start, as a fraction of the layer's nominal duration. */
  atFraction: number;
  durationS: number;
  /** Rate multiplier during the spike. */
  factor: number;
}

export interface SynthOptions {
  /** @default 1 */
  seed?: number;
  /** @default 0.1 */
  sampleIntervalS?: number;
  /** Gaussian noise σ as a fraction of full scale (signal 1.0 × gain). @default 0.001 */
  noiseFraction?: number;
  /** Detector gain at t = 0. @default 1 */
  gain?: number;
  /** Linear gain drift, fraction per hour. @default 0 */
  gainDriftPerHour?: number;
  /** Detector offset (dark reading). @default 0 */
  offset?: number;
  /** Lamp-off (dark) samples at the very start, seconds. @default 0 */
  darkS?: number;
  /** Mean deposition rate per material (nm/s); a material not listed gets `defaultRateNmPerS`. @default {} */
  rateNmPerS?: Record<string, number>;
  /** @default 0.3 */
  defaultRateNmPerS?: number;
  /** Layer-to-layer random rate scatter, fraction (σ). @default 0.02 */
  rateScatter?: number;
  /** Rate change over each layer, as a fraction of its rate (a = f·r/T). @default 0 */
  rateDriftFraction?: number;
  /** Constant index deviation per material from its nominal at the monitor wavelength. @default {} */
  indexOffset?: Record<string, number>;
  /** Index drift across the run, per material, index units per hour. @default {} */
  indexDriftPerHour?: Record<string, number>;
  /**
   * Random thickness (cut) error per level-cut layer, fraction (σ); also a turning-point layer's
   * where its signal does not turn within half a quarter-wave of the design's thickness. @default 0.004
   */
  thicknessScatter?: number;
  /**
   * A turning-point cut's overshoot past the true turning point, uniform on [lo, hi], fraction of
   * the thickness there: the controller cuts once it has seen the signal turn, never before (a few
   * tenths of a per cent: common practice).
   * @default [0.001, 0.006]
   */
  turningPointOvershoot?: [number, number];
  /** Extra thickness for late cuts, fraction (of the design's or the turning point's thickness), by layer number. @default {} */
  overshoot?: Record<number, number>;
  /** @default [] */
  rateSpikes?: RateSpike[];
  /** Shutter closed mid-layer (no growth, layer column 0), by layer. @default [] */
  pauses?: { layer: number; atFraction: number; durationS: number }[];
  /** Bare-chip stretch before each chip's first layer, s. @default 20 */
  bareChipS?: number;
  /** Idle settling between layers, s. @default 3 */
  settleS?: number;
  /** When set, a crystal_nm column: the crystal reads physical thickness / tooling per material. */
  tooling?: Record<string, number>;
  /**
   * A periodic modulation of the detector gain, e.g. a wobbling rotating substrate holder:
   * gain × (1 + fraction·sin(2π·frequencyHz·t)). @default none
   */
  ripple?: { frequencyHz: number; fraction: number };
  /** @default true */
  layerColumn?: boolean;
  /** @default true */
  chipColumn?: boolean;
  /** Metadata lines of the CSV. @default {} */
  meta?: Record<string, string>;
}

/** What was really deposited, per layer. */
export interface LayerTruth {
  layer: number;
  material: string;
  chip: number;
  thicknessNm: number;
  /** Real index at the monitor wavelength. */
  index: number;
  /** Index the design's material gives at the monitor wavelength. */
  nominalIndex: number;
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  startTimeS: number;
  endTimeS: number;
  /** Gain at the layer's start. */
  gain: number;
  /** (n·d − n_design·d_design)/(λ/4)·100 at the monitor wavelength. */
  cutErrorQwotPct: number;
  qwotAtMonitor: number;
}

export interface SynthRun {
  design: Design;
  meta: Record<string, string>;
  timeS: Float64Array;
  signal: Float64Array;
  layer: Int32Array;
  chip: Int32Array;
  crystalNm: Float64Array | null;
  truth: LayerTruth[];
  options: SynthOptions;
}
