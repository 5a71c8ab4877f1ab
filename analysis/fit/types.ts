import { type MaterialDrift } from '../stats';
import { type ChipCalibration } from './calibrateChip';
import { type LayerSpectrum } from './layerSpectrum';
import { type SampleWork, type SampleWorkResult } from './layerSampleWork';

export type AnalysisMode = 'sequential' | 'refit';

export interface AnalyzeOptions {
  /** @default 'sequential' */
  mode?: AnalysisMode;
  /** Most points per layer in the iterations: means of bins equal in time (fit/subsample.ts binMeans); residuals use all samples. @default 400 */
  maxFitPoints?: number;
  /**
   * Bin means per layer in a joint re-fit of the chip after each layer (refit mode); 0 skips
   * these (a quarter less time; the errors of the plain runs stay, but a layer with a rate spike
   * then pulls its neighbours, and reflectance runs lose accuracy). @default 100
   */
  refitPointsPerLayer?: number;
  /** Bin means in all, shared by the chip's layers (each at most maxFitPoints), in the final joint fit. @default 3200 */
  refitFinalPoints?: number;
  /**
   * 'chip': one gain per chip from its bare-chip calibration, held in sequential mode; in refit
   * mode the joint fit refines it (with a linear drift G·(1 + γ·t) if gainDrift). 'per-layer':
   * each layer fits its own gain, which also absorbs part of the error of the stack below as
   * estimated (and of a slow gain drift), at some cost in precision.
   * @default 'per-layer' in sequential mode, 'chip' in refit mode
   */
  gain?: 'per-layer' | 'chip';
  /** Gain mode 'chip', refit: also fit a linear gain drift γ per chip (costs precision; for lamp drift). @default false */
  gainDrift?: boolean;
  /**
   * Estimate the detector's gain drift from the bare-chip calibrations of successive chips (two
   * or more) and apply it within every chip, when it exceeds twice its σ. @default true
   */
  gainDriftFromChips?: boolean;
  /**
   * Fit a chip's detector offset (stray light) from its first layers when it has no dark samples
   * (reflectance monitoring; see fit/chipCalibrations.ts); false keeps the offset assumed from
   * other chips or zero. @default true
   */
  fitOffset?: boolean;
  /**
   * Gain mode 'per-layer': a Gaussian prior holding each layer's gain near the chip calibration
   * (with any known drift), σ as a fraction of the gain; 0 leaves the gains free. @default 0.005
   */
  gainPriorFraction?: number;
  /**
   * Layers below this many quarter-waves at the monitor wavelength get a free trial fit, and
   * their index is held when that fit cannot separate it from the thickness (heldIndexCorrelation,
   * heldIndexSigma). @default 0.9
   */
  thinLayerQwot?: number;
  /** A thin layer's index is held when its trial fit's index–thickness |correlation| exceeds this. @default 0.99 */
  heldIndexCorrelation?: number;
  /**
   * Huber's loss in every fit, so spikes and outliers count less (fit/solver/huber.ts). Off by
   * default: the fits work on bin means, which dilute short spikes, and on the chamber simulator's
   * spiky traces Huber changed the errors by < 0.03 % while its 5 % efficiency loss cost the
   * white-noise mirror 0.04 % in thickness. @default false
   */
  robustLoss?: boolean;
  /**
   * Let a layer's rate wander within it (knots under an Ornstein–Uhlenbeck prior, fit/rateWander.ts)
   * where the restricted likelihood prefers that to the plain d = r·τ + a·τ²/2 (fit/wanderChoice.ts).
   * Off by default, measured on the chamber simulator with the defaults otherwise: it helps where
   * the rate wanders (rate-wander mirror, refit 1.65 → 1.12 %; real-chamber mirror 1.71 → 1.17 %;
   * 40 layers sequential 3.3 → 2.0 %) and hurts elsewhere (correlated noise and spikes, sequential
   * 0.88 → 1.26 %; 40 layers refit 1.24 → 1.83 %; R with an offset, refit 0.82 → 1.02 %), and on
   * the project's synthetic 18-layer mirror (a steady rate) refit no longer beats sequential: the
   * wander is chosen on layers where the rate did not wander. @default false
   */
  rateWander?: boolean;
  /**
   * Read the growth after a turning-point cut from where the next layer on the chip starts on its
   * fringe (fit/growthFromNext.ts, re-read after each chip's joint fit, fit/jointGrowth.ts). With
   * it off a turning-point cut's growth is not told by anything in the run, and its possible size
   * (a shutter of up to 2 s) goes into σ: on a trace without a shutter delay σ_d grows from about
   * 0.15 % to 0.5 %. It takes up some misfit of the stack below (a stray offset, correlated noise)
   * as growth. @default true
   */
  growthFromNext?: boolean;
  /** …or when its trial fit's index σ exceeds this. @default 0.05 */
  heldIndexSigma?: number;
  /** The index a thin layer is held at: the nominal, or this run's drift estimate. @default 'run-drift' */
  heldIndex?: 'nominal' | 'run-drift';
  /**
   * Residual RMS above this multiple of the noise reference draws a warning. The reference is
   * the idle-stretch noise when there are ≥ 1000 idle samples, else the run's median layer
   * residual. @default 1.5
   */
  residualWarnFactor?: number;
  /** |cut error| above this (% QWOT) draws a warning. @default 2 */
  cutErrorWarnPct?: number;
  /** Wavelength range of the as-built spectrum. @default { fromNm: 400, toNm: 800, stepNm: 2 } */
  spectrum?: { fromNm: number; toNm: number; stepNm: number };
  /** Also return the fitted model at every trace sample (AnalysisResult.model). @default false */
  modelSeries?: boolean;
  /** Called after each layer's fit. */
  onProgress?: (layersDone: number, layerCount: number) => void;
  /**
   * Computes a layer's spectrum (fit/layerSpectrum.ts, from its samples only) elsewhere, e.g. on
   * another thread. When given, every layer's is asked for before the first fit, so they are
   * ready as the fits reach them; it must resolve to what layerSpectrum would return. Given
   * `work`, it may add what layerSampleWork returns for it (the turning points the samples show,
   * their bin means), which the fits and results then take.
   * @default layerSpectrum, in turn, on this thread
   */
  spectrumOf?: (tauS: Float64Array, y: Float64Array, wavelengthNm: number, index: number, work?: SampleWork) => Promise<LayerSpectrum & Partial<SampleWorkResult>>;
}

export interface TurningPointAt {
  timeS: number;
  /** Modelled signal, fraction 0–1. */
  signal: number;
  kind: 'max' | 'min';
  thicknessNm: number;
}

export interface LayerResult {
  layer: number;
  material: string;
  chip: number;
  wavelengthNm: number;
  mode: 'R' | 'T';
  cut: 'turning-point' | 'level';
  designThicknessNm: number;
  /** QWOT of the design layer at the design's reference wavelength. */
  qwot: number;
  /** Deposited optical thickness in quarter-waves at the monitor wavelength. */
  qwotDeposited: number;
  thicknessNm: number;
  thicknessSigmaNm: number;
  /** Real index at the monitor wavelength. */
  index: number;
  indexSigma: number;
  nominalIndex: number;
  /** index − nominalIndex. */
  indexDeviation: number;
  indexHeld: boolean;
  rateNmPerS: number;
  rateSigmaNmPerS: number;
  rateDriftNmPerS2: number;
  rateDriftSigmaNmPerS2: number;
  /** Detector gain during the layer (per-layer refinement of the chip calibration). */
  gain: number;
  /** (n·d − n_design·d_design)/(λ/4)·100 at the monitor wavelength, n_design the nominal index. */
  cutErrorQwotPct: number;
  cutErrorSigmaQwotPct: number;
  /** RMS of (reading − model)/gain over all the layer's samples: fraction of full scale. */
  residualRms: number;
  /** residualRms over the noise reference (see AnalyzeOptions.residualWarnFactor); ≈ 1 for a good fit. */
  residualToNoise: number;
  startTimeS: number;
  /** When the layer was cut: its last sample. */
  cutTimeS: number;
  /** When it should have been cut, from the fitted d(t): the modelled turning point (turning-point cut) or the target optical thickness (level cut); extrapolated beyond the data if need be. */
  idealCutTimeS: number | null;
  /** The last extremum of the fitted model within the layer. */
  lastTurningPoint: TurningPointAt | null;
  /** Extrema found in the data itself (hysteresis search on the smoothed signal), confirmed ones. */
  observedTurningPoints: number;
  /** The last extremum in the data (signal as a fraction, via the gain); unconfirmed when the layer was cut on it. */
  lastObservedTurningPoint: { timeS: number; signal: number; kind: 'max' | 'min'; confirmed: boolean } | null;
  /** The crystal's reading at the layer's end, where the trace has crystal_nm. */
  crystalNm: number | null;
  /** thicknessNm / crystalNm (tooling-factor check). */
  opticalToCrystalRatio: number | null;
  /** Dominant fringe frequency of the layer's signal (its amplitude spectrum, trace/fringeSpectrum); null under ~1.5 fringes. */
  fringeFrequencyHz: number | null;
  /** The rate that frequency implies, f·λ/(2n), nm/s: the fit's independent first guess. */
  fringeRateNmPerS: number | null;
  /** Periodic disturbances seen in the layer's spectrum; amplitude as a fraction of full scale. */
  disturbances: { frequencyHz: number; amplitude: number; note: string }[];
  sampleCount: number;
  fitPoints: number;
  iterations: number;
  converged: boolean;
  warnings: string[];
}

export interface ToolingCheck {
  material: string;
  layers: number[];
  meanRatio: number;
  ratioSigma: number;
}

export interface AnalysisResult {
  format: 'fringelog.analysis/1';
  mode: AnalysisMode;
  design: string;
  segmentsInferred: boolean;
  layers: LayerResult[];
  chips: ChipCalibration[];
  indexDrift: MaterialDrift[];
  tooling: ToolingCheck[];
  spectrum: { wavelengthNm: Float64Array; designR: Float64Array; designT: Float64Array; asBuiltR: Float64Array; asBuiltT: Float64Array };
  warnings: string[];
  /** With AnalyzeOptions.modelSeries: the modelled reading (detector units) at every trace sample, NaN outside fitted layers. */
  model?: Float64Array;
}
