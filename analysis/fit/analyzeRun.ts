import { type Design, type DesignLayer } from '../design';
import { indexAt, indexAtMemo } from '../materials';
import { type Complex, type LayerAt } from '../optics';
import { driftEstimateAt, newVariogramPool, NOMINAL_INDEX_SIGMA, type IndexPoint } from '../stats';
import { median, noiseSigma, segmentTrace, type Segment, type TraceData } from '../trace';
import { type ChipCalibration } from './calibrateChip';
import { calibrateChips, gainDriftFromChips } from './chipCalibrations';
import { fitLayers, GRADIENT_BOUND, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { assertEveryLayerSampled } from './everyLayerSampled';
import { gatherLayerSamples, type LayerSamples } from './layerSamples';
import { gapsBetween, idleNoiseModel } from './idleNoiseModel';
import { LayerEnds } from './layerEnds';
import { layerAtWavelength, type FitLayerData, type LayerParams, type MonitorOptics } from './layerModel';
import { layerResidualRms, layerResult, modelResidualsRequest } from './layerResult';
import { holdsChipGain, holdsLevelCutGain } from './levelCutGain';
import { carryHeldGainSigma } from './heldGainSigma';
import { monitorWavelengthMismatch } from './monitorWavelengthMismatch';
import { carryOffsetSigma } from './offsetSigma';
import { DEFAULT_LAMP_STABILITY_PER_HOUR, gainDriftPrior } from './gainDriftPrior';
import { lampDriftNote } from './lampDriftNote';
import { carryGainDriftSigma, carryJointGainDriftSigma, driftShareThroughStack, gainDriftShift, reportedGainDriftShift, swapGainDriftShare, swapIndexGainDriftShare } from './gainDriftSigma';
import { layerSpectrum, type LayerSpectrum } from './layerSpectrum';
import { type SampleWorkResult } from './layerSampleWork';
import { type ObservedTurningPoints } from './observedTurningPoints';
import { PROFILE_PASS_SPECTRUM_QWOT, requestSpectra } from './requestSpectra';
import { sampleReadings } from './sampleReadings';
import { runSummary } from './runSummary';
import { placeBoundaries } from './placeBoundaries';
import { levelCutEnds } from './levelCutEnds';
import { turningPointEndS, turningPointEndSigma, turningPointEndsOnChip } from './turningPointEnd';
import { excessErrorMeanSquare, excessErrorVariance, excessMeanShiftNm, TURNING_POINT_OVERSHOOT_PCT, turningPointCompensation, turningPointExcess, type TurningPointExcess } from './turningPointExcess';
import { segmentByDesign } from './designSegments';
import { compressedReading, withLinearisedSignal } from './detectorLinearity';
import { lampRippleOf, runDisturbanceWarning, runLinesFromRequest, runLinesRequest, type LampRipple } from './runDisturbances';
import { carryStackUncertainty, emptyStack, shiftThroughStack, type StackCovariance } from './stackUncertainty';
import { stackPosteriorStep, type Nuisance } from './stackPosterior';
import { startValues } from './startValues';
import { holdUncarriedDrifts } from './rateDriftChoice';
import { heldIndexSigmaIntoChip, shiftWithHeldIndex } from './heldIndexSigma';
import { heldGrowthSigmaIntoChip } from './heldGrowthSigma';
import { indexSeparation, type HeldIndexShift } from './thinLayer';
import { GRADIENT_MIN_QWOT, judgeGradient, reviewGradient, type GradientTrial } from './indexGradient';
import { binMeans } from './subsample';
import { lawRate, lawThickness, lawTimeToThickness, type RateWander } from './rateWander';
import { assertLayersSeen } from './layersSeen';
import { chipColumnWarnings } from './chipColumnCheck';
import { timeUnitWarning } from './timeUnits';
import { cutPastTurningPointNm, endSigmaAfterPrior, overshootPosterior, overshootSeen, relativeCut, relativeCutShiftNm, type RunOvershoot } from './cutPastTurningPoint';
import { populationMixture, truncatedPopulation } from './shutterTime';
import { turningPointNearNm } from './cutTiming';
import { chooseRateWander, finishRateWander, wanderEndVariance, withWanderVariance, type WanderChoice } from './wanderChoice';
import { wanderChoiceRequest } from './wanderChoiceRequest';
import { type WanderPrep } from './wanderPrep';
import { sharedWanderCosts, sharedWanders, type WanderEvidence } from './pooledWander';
import { poolIndices } from './pooledIndex';
import { addWanderVariance, wanderErrorVariances, wanderVariancesFromRequest, wanderVariancesRequest, type WanderErrorVariance } from './wanderSigma';
import { onExposureClock } from './startTransient';
import { pooledStartDelay, unresolvedDelaySigma, unresolvedLevelDelaySigma, type PooledStartDelay, type StartDelayProfile } from './startDelay';
import { profileFromRequest, startDelayLayerRequest, type StartDelayLayerRequest } from './startDelayRequest';
import { binsOnExposureClocks } from './profileBins';
import { carryJointStartDelaySigma, carryStartDelaySigma, startDelayNote } from './startDelaySigma';
import { driftAtDelay, jointStartDelayProfile, pooledLevelDelay, type JointStartDelayProfile } from './jointStartDelay';
import { withLampReference } from './lampReference';
import { fitHeldAgain, fitWithNextLayers, withRefitted, type PairPart } from './fitWithNextLayer';
import { type AnalysisResult, type AnalyzeOptions } from './types';

/** Everything known about one layer while the run is analysed. */
export interface LayerState {
  design: DesignLayer;
  samples: LayerSamples;
  optics: MonitorOptics;
  nominal: Complex;
  fit: FitLayerData;
  refit: FitLayerData;
  /** Builds the layer's fit data with at most maxPoints samples. */
  make: (maxPoints: number) => FitLayerData;
  estimate: LayerEstimate;
  iterations: number;
  converged: boolean;
  fitPoints: number;
  wellDetermined: boolean;
  heldNote: string | null;
  /** Why the index was held (from the trial fit), for the note. */
  heldWhy?: string;
  /** The layer's trial fit with a free index gradient (option indexGradient), kept or not. */
  gradientTrial?: GradientTrial;
  /** σ of the held index (the drift estimate's prediction σ, or the nominal's). */
  heldIndexSigma?: number;
  /** Variance of the wander's share of the end thickness, nm², from the layer's own fit (joint fits hold the wander). */
  wanderVarianceNm2?: number;
  /** The wander the plain law does not follow, carried into σ only (option wanderSigma). */
  unmodelledWander?: RateWander;
  /** Its cost to the sequential fit's figures, added to σ after the pass. */
  unmodelledVariance?: WanderErrorVariance;
  /** The layer's wander choice, for its material's shared wander (sequential with option wanderSigma; refit with option rateWander). */
  wanderEvidence?: WanderEvidence<WanderErrorVariance>;
  /**
   * Sequential: the gain drift's shift per σ as the pass carried it (`held`, the layer refitted on
   * its stack held) and as reported (`chained`: the offset profile's response and the stack's), and
   * the layer's σ when its fit was done (`atFit`, the held share in it).
   */
  gainDriftShares?: { held: HeldIndexShift; chained: HeldIndexShift; atFit: HeldIndexShift };
  /** Refit: what one σ of the held lamp drift moved the layer by in the chip's final joint fit (fit/lampDriftNote.ts). */
  lampDriftShift?: HeldIndexShift;
  /** The least-squares fit's residual RMS (model units) on demand, where the index pooling moved the estimates since (fit/pooledIndex.ts). */
  lawResidualRms?: () => number;
  /** Gives the layer a wander to fit (refit, option rateWander: its material's shared one, where its own choice kept none). */
  takeWander?: (w: RateWander) => void;
  calibration: ChipCalibration;
  /** Design optical thickness in quarter-waves at the monitor wavelength. */
  qwotAtMonitor: number;
  /** Weight of the layer in joint fits (see FitLayerData.weight). */
  weight: number;
  spectrum: LayerSpectrum;
  /** The turning points the layer's readings show, when computed with its spectrum (AnalyzeOptions.spectrumOf). */
  observed?: ObservedTurningPoints;
  /** Sequential: the stack below as the layer's fit last stood on it, and that fit again on another stack. */
  fittedOn?: { below: LayerAt[]; again: (below: LayerAt[], start: LayerEstimate) => JointFitResult };
  /** Sequential: what the layer brings to a joint fit with the next one (option fitWithNextLayer, fit/fitWithNextLayer.ts). */
  pairPart?: PairPart;
  /** Sequential: the layer's own fit again with the chip's offset moved by `dOffset` (and the gain with it), on a stack below. */
  offsetAgain?: (below: LayerAt[], start: LayerEstimate, dOffset: number) => JointFitResult;
}

function heldNoteFor(held: number, nominal: number, from: number, qwot: number, wl: number, wholeRun: boolean, why: string): string {
  const basis = from > 0
    ? `nominal ${nominal.toFixed(4)} + the drift estimate from ${from} fitted layer${from > 1 ? 's' : ''} of ${wholeRun ? 'the whole run' : 'this run so far'}`
    : "the material's nominal";
  return `index held at ${held.toFixed(4)} (${basis}): the layer is ${qwot.toFixed(2)} QWOT at ${wl} nm and ${why}; thickness only (rate drift not fitted)`;
}

export const ANALYZE_DEFAULTS = {
  mode: 'sequential',
  maxFitPoints: 400,
  refitPointsPerLayer: 100,
  refitFinalPoints: 3200,
  gainDrift: false,
  gainDriftFromChips: true,
  lampStabilityPerHour: DEFAULT_LAMP_STABILITY_PER_HOUR,
  lampDriftFit: false,
  lampReference: true,
  fitOffset: true,
  offsetAdoptionSigma: 3,
  offsetAveraging: true,
  unmeasuredOffsetSigma: 0.003,
  gainPriorFraction: 0.005,
  levelCutGain: 'calibration',
  reflectanceChipGain: true,
  thinLayerQwot: 0.9,
  heldIndexSigma: 0.05,
  heldIndexCorrelation: 0.99,
  heldIndexLevelCut: true,
  robustLoss: false,
  rateWander: false,
  wanderSigma: true,
  indexGradient: false,
  growthFromNext: true,
  levelGrowthFromNext: true,
  shutterTimePopulation: 'normal' as 'normal' | 'truncated' | 'mixture',
  overshootPopulation: 'mixture' as 'uniform' | 'truncated' | 'mixture',
  fitOnFinalStack: true,
  fitWithNextLayer: true,
  stackFromLayer: false,
  turningPointOvershootPct: TURNING_POINT_OVERSHOOT_PCT,
  turningPointExcessMean: true,
  cutPastTurningPoint: true,
  pooledIndex: true,
  holdUncarriedDrift: true,
  startTransient: true,
  levelStartTransient: false,
  sequentialLevelClock: false,
  heldIndex: 'run-drift',
  residualWarnFactor: 1.5,
  cutErrorWarnPct: 2,
  spectrum: { fromNm: 400, toNm: 800, stepNm: 2 },
  modelSeries: false,
  runDisturbances: true,
  rippleDivide: true,
} as const;

function pick(y: ArrayLike<number>, positions: Int32Array, base?: Int32Array): Float64Array {
  const out = new Float64Array(positions.length);
  for (let i = 0; i < positions.length; i++) out[i] = y[base ? base[positions[i]] : positions[i]];
  return out;
}

/**
 * Fits every layer of a run: per chip gain/offset calibration, then each layer's index, rate and
 * rate drift (and a per-layer gain) against the growing-layer model on the chip's stack as
 * deposited. `refit` re-estimates all layers of the chip jointly after each layer (see refitChip).
 * With `startTransient` (on by default; and a layer column) a layer-by-layer pass first profiles
 * every layer in the run's start delay (fit/startDelay.ts); where the pooled delay is kept, the
 * run is analysed with it held, each fit refitted with it one σ longer for its share of the
 * layer's σ (fit/startDelaySigma.ts). With a `reference` column (option lampReference) the
 * signal is first divided by the lamp's own reading and the lamp drift's prior tightened
 * (fit/lampReference.ts). Pure: no I/O.
 */
export async function analyzeRun(design: Design, trace: TraceData, options: AnalyzeOptions = {}): Promise<AnalysisResult> {
  const linear = withLinearisedSignal(trace, options);
  if (!linear.note) return analyzeReadings(design, trace, options);
  const result = await analyzeReadings(design, linear.trace, options);
  // the model in the trace's own units: read through the detector as entered
  if (result.model) for (let i = 0; i < result.model.length; i++) result.model[i] = compressedReading(result.model[i], linear.k);
  return { ...result, warnings: [linear.note, ...result.warnings] };
}

/** analyzeRun on readings proportional to the light (a detector linearised where the shop said how). */
async function analyzeReadings(design: Design, trace: TraceData, options: AnalyzeOptions): Promise<AnalysisResult> {
  const referenced = withLampReference(trace, options);
  if (!referenced.note) return withRippleDivided(design, trace, options, await analyzeSignal(design, trace, options));
  const result = await analyzeSignal(design, referenced.trace, referenced.options);
  // the model in the trace's own units, the lamp as the reference read it put back
  if (result.model) for (let i = 0; i < result.model.length; i++) result.model[i] *= referenced.lamp![i];
  return { ...result, warnings: [referenced.note, ...result.warnings] };
}

/** The lamp ripple the reported pass's residuals showed on each trace (fit/runDisturbances.ts lampRippleOf), where they did. */
const ripples = new WeakMap<TraceData, LampRipple>();
/** A ripple is divided out only where the fit tells it this many σ from 0. */
const RIPPLE_SIGMAS = 5;

/**
 * Without a reference column, a lamp ripple the run's residuals show (a line through the run,
 * fit/runDisturbances.ts) divided out of the signal and the run analysed again (option
 * rippleDivide): the reference column's division, with the lamp's ripple read from the data.
 * The first analysis's figures carry the ripple's misfit; the second's are reported, with a note.
 */
async function withRippleDivided(design: Design, trace: TraceData, options: AnalyzeOptions, first: AnalysisResult): Promise<AnalysisResult> {
  const ripple = ripples.get(trace);
  if (!ripple || !(options.rippleDivide ?? ANALYZE_DEFAULTS.rippleDivide) || !(ripple.amplitude > RIPPLE_SIGMAS * ripple.amplitudeSigma)) return first;
  const w = 2 * Math.PI * ripple.frequencyHz;
  const lamp = Float64Array.from(trace.timeS, (t) => 1 + ripple.a * Math.sin(w * t) + ripple.b * Math.cos(w * t));
  const signal = Float64Array.from(trace.signal, (v, i) => v / lamp[i]);
  // (the trace's warnings as the first analysis left them, its sample warnings among them)
  const second = await analyzeSignal(design, { ...trace, signal, warnings: [...trace.warnings] }, { ...options, sampleWarnings: undefined });
  if (second.model) for (let i = 0; i < second.model.length; i++) second.model[i] *= lamp[i];
  const note = `lamp ripple divided out: ${(ripple.amplitude * 100).toFixed(3)} ± ${(ripple.amplitudeSigma * 100).toFixed(3)} % at ${ripple.frequencyHz.toPrecision(4)} Hz, `
    + 'read from the first analysis\'s residuals (option rippleDivide); the figures are the run analysed again on the divided signal';
  return { ...second, warnings: [note, ...first.warnings.filter((x) => x.startsWith('periodic disturbance through the run')), ...second.warnings] };
}

async function analyzeSignal(design: Design, trace: TraceData, options: AnalyzeOptions): Promise<AnalysisResult> {
  const basis = runBasis(design, trace);
  // (a profiling pass keeps no warnings: the trace's made elsewhere are awaited only before the pass that reports)
  const sampleWarnings = async () => {
    if (options.sampleWarnings) trace.warnings.push(...(await options.sampleWarnings));
  };
  if (!(options.startTransient ?? ANALYZE_DEFAULTS.startTransient)) {
    await sampleWarnings();
    return analyzePass(design, trace, options, { delayS: 0 }, basis);
  }
  // Every layer cut on level: δ from each chip's joint fit with the lamp drift fitted under its
  // prior (fit/jointStartDelay.ts). With option levelStartTransient, where kept, the layers on its
  // clock and the drift fitted so in refit. Without the option, or where not kept, the level cuts
  // stay on real time, and the δ the profile allows (its root mean square about 0, fit/startDelay.ts
  // unresolvedLevelDelaySigma) goes into their σ: on such runs the start-up was otherwise in no σ
  // (chamber simulator's real-chamber BBAR, ramp 1.5 s, refit seeds 21–40: layer 2's index, 0.41
  // QWOT, biased +0.007 to +0.016 at σ 0.003–0.004; 3σ coverage of the index 91.7 → 98.3 %, RMS z
  // 1.75 → 1.20, no estimate moved; with the ramp off, RMS z 1.12 → 1.11).
  const levelRun = levelCutRun(design, trace);
  const level = levelRun && (options.levelStartTransient ?? ANALYZE_DEFAULTS.levelStartTransient);
  const levelFound = levelRun ? await findLevelStartDelay(design, trace, options, basis) : null;
  const pooled = levelRun ? levelFound : await findStartDelay(design, trace, options, basis);
  await sampleWarnings();
  const applied = !!pooled?.kept && (level || !levelRun);
  if (!applied) {
    // the layers on real time; a delay not resolved carried into their σ (fit/startDelay.ts
    // unresolvedDelaySigma, unresolvedLevelDelaySigma; at δ = 0 levelOnClock marks the level cuts as the layers that carry it)
    const sigmaS = !pooled ? 0 : levelRun ? unresolvedLevelDelaySigma(pooled) : unresolvedDelaySigma(pooled);
    const plain = await analyzePass(design, trace, options, { delayS: 0, ...(sigmaS > 0 ? { sigmaS, ...(levelRun ? { levelOnClock: true } : {}) } : {}) }, basis);
    // (a note, what the analysis did: it does not flag the run, analysisNotes.ts)
    return { ...plain, warnings: pooled ? [...plain.warnings, startDelayNote(pooled, levelRun ? 'chip' : 'layer', false, levelRun && !level)] : plain.warnings };
  }
  // (where kept, the drift is fitted as the profile fitted it: held at δ̂, its estimate takes up the start-up again)
  // (sequential mode holds each chip's drift at the profile's, fit/jointStartDelay.ts driftAtDelay, its
  // level cuts on real time unless option sequentialLevelClock: each layer's own fit on δ̂'s clock
  // took δ's error into its thickness where the lamp's prior let the drift trade with δ, layer 4 of
  // the chamber BBAR about 1.7 % per second of δ, where the unmodelled ramp cost it less)
  const levelOnRealTime = level && (options.mode ?? ANALYZE_DEFAULTS.mode) === 'sequential' && !(options.sequentialLevelClock ?? ANALYZE_DEFAULTS.sequentialLevelClock);
  const result = await analyzePass(design, trace, level ? { ...options, lampDriftFit: true } : options, {
    ...(levelOnRealTime ? { delayS: 0 } : { delayS: pooled.delayS, sigmaS: pooled.sigmaS, levelOnClock: level }),
    ...(levelFound ? { heldDrifts: levelFound.chipDrifts } : {}),
  }, basis);
  result.warnings.push(startDelayNote(pooled, level ? 'chip' : 'layer', levelOnRealTime));
  return result;
}

/**
 * The run's start delay (fit/startTransient.ts) from a layer-by-layer pass that profiles each
 * layer of ≥ 0.5 QWOT with a fitted index in it (fit/startDelay.ts), pooled; null without a
 * layer column (boundaries placed on the design's curve put each start where growth showed).
 */
export async function findStartDelay(design: Design, trace: TraceData, options: AnalyzeOptions = {}, basis?: RunBasis): Promise<PooledStartDelay | null> {
  if (!trace.layer) return null;
  const profiles: Promise<(StartDelayProfile | null)[]>[] = [];
  // Without the next layer's start read as growth below: that reading takes up the start delay
  // (near an extremum both first add a slope at the start; measured on the chamber simulator the
  // layers' profiles then came out flat), so here the growth stands on the idle levels.
  // The pass's own fits only build the stack each profile stands on: on a quarter of the points
  // (measured on the bench's 40-layer run, δ̂ 1.253 ± 0.375 s on 100 against 1.253 ± 0.374 s on 200
  // and 1.253 ± 0.375 s on 400; 200 took 2/3 the CPU of 400).
  const maxFitPoints = Math.min(options.maxFitPoints ?? ANALYZE_DEFAULTS.maxFitPoints, PROFILE_PASS_POINTS);
  await analyzeLayers(design, trace, { ...options, mode: 'sequential', modelSeries: false, onProgress: undefined, growthFromNext: false, maxFitPoints }, { delayS: 0, profiles }, basis);
  return pooledStartDelay((await Promise.all(profiles)).flat().filter((p): p is StartDelayProfile => p !== null));
}

/** A run with a layer column whose every layer is cut on level (its start delay read from the chips' joint fits). */
function levelCutRun(design: Design, trace: TraceData): boolean {
  return !!trace.layer && design.layers.every((l) => l.monitor.cut === 'level');
}

/**
 * The start delay of a run cut on level (option levelStartTransient): a pass in refit mode with
 * the lamp drift fitted under its prior, each chip's final joint fit profiled in δ with the drift
 * refitted (fit/jointStartDelay.ts), the chips' profiles pooled as startDelay.ts pools layers'.
 */
export async function findLevelStartDelay(design: Design, trace: TraceData, options: AnalyzeOptions = {}, basis = runBasis(design, trace)): Promise<(PooledStartDelay & { chipDrifts: Map<number, HeldDrift> }) | null> {
  if (!trace.layer) return null;
  const profiles: { chip: number; profile: JointStartDelayProfile }[] = [];
  await analyzeLayers(design, trace, { ...options, mode: 'refit', gain: 'chip', lampDriftFit: true, modelSeries: false, onProgress: undefined }, { delayS: 0, jointProfiles: profiles }, basis);
  const p = pooledLevelDelay(profiles.map((c) => c.profile));
  if (!p) return null;
  return { ...p, chipDrifts: new Map(profiles.map((c) => [c.chip, driftAtDelay(c.profile, p.delayS, p.sigmaS)])) };
}

/** Fit points per layer in the start delay's profiling pass (fit/startDelay.ts's profiles use PROFILE_POINTS). */
const PROFILE_PASS_POINTS = 100;

/** What a pass takes of the start transient: the delay held, its σ (carried into every layer: fit/startDelaySigma.ts), and where to put each layer's profile. */
interface PassTransient {
  delayS: number;
  sigmaS?: number;
  profiles?: Promise<(StartDelayProfile | null)[]>[];
  /** Level-cut layers on the exposure clock too (option levelStartTransient); at δ = 0, the level cuts carry δ's σ. */
  levelOnClock?: boolean;
  /** Where to put each chip's profile from its final joint fit (a pass in refit mode; fit/jointStartDelay.ts). */
  jointProfiles?: { chip: number; profile: JointStartDelayProfile }[];
  /** Each chip's gain drift to hold (where not fitted) and its σ, in place of the run's (from jointProfiles). */
  heldDrifts?: Map<number, HeldDrift>;
}

/** A gain drift held in the fits, per second, and its σ (carried into the layers' σ: fit/gainDriftSigma.ts). */
interface HeldDrift {
  perS: number;
  sigmaPerS: number;
}

async function analyzePass(design: Design, trace: TraceData, options: AnalyzeOptions, transient: PassTransient, basis?: RunBasis): Promise<AnalysisResult> {
  return (await analyzeLayers(design, trace, options, transient, basis))!;
}

/** What every pass reads alike from the trace (computed once for the profiling pass and the analysis): its segmentation, each layer's samples, the idle stretches' noise. */
interface RunBasis {
  byDesign: ReturnType<typeof segmentByDesign> | null;
  seg: ReturnType<typeof segmentTrace> | (ReturnType<typeof segmentByDesign> & { inferred: true });
  gathered: Map<number, LayerSamples>;
  /** Without a layer column: each layer's placed start and end, with the spread their readings allow (fit/levelCutEnds.ts). */
  placed: readonly Segment[];
  /** The idle stretches' noise (made on first call, after the passes have asked for their spectra: the second thread works meanwhile). */
  noise: () => { idleModel: ReturnType<typeof idleNoiseModel>; noiseFloor: ReturnType<typeof idleNoise> };
}

function runBasis(design: Design, trace: TraceData): RunBasis {
  // Without a layer column the design segments the trace (designSegments), not the signal alone.
  const byDesign = trace.layer ? null : segmentByDesign(trace, design);
  const seg = byDesign ? { ...byDesign, inferred: true as const } : segmentTrace(trace, { chipOfLayer: (l) => design.layers[l - 1]?.monitor.chip ?? 1 });
  const layerSegments = byDesign ? levelCutEnds(trace, design, placeBoundaries(trace, design, byDesign.layers, byDesign.windows), byDesign.gain) : seg.layers;
  let noise: ReturnType<RunBasis['noise']> | null = null;
  return {
    byDesign, seg, gathered: gatherLayerSamples(trace, layerSegments), placed: byDesign ? layerSegments : [],
    // The design's windows around each pause hold the slow ends of the layers beside it, which the
    // noise model's long lags would read as noise: there, the gaps between the placed layers.
    noise: () => (noise ??= { idleModel: idleNoiseModel(trace, byDesign ? gapsBetween(layerSegments) : seg.idle), noiseFloor: idleNoise(trace, seg.idle) }),
  };
}

/** The pass; a profiling pass (transient.profiles) stops after the layers' fits, with no result (null). */
async function analyzeLayers(
  design: Design, trace: TraceData, options: AnalyzeOptions, transient: PassTransient, basis = runBasis(design, trace),
): Promise<AnalysisResult | null> {
  const refitMode = (options.mode ?? ANALYZE_DEFAULTS.mode) === 'refit';
  const o = {
    ...ANALYZE_DEFAULTS, ...options, gain: options.gain ?? (refitMode ? 'chip' : 'per-layer'),
    shutterTimeGrowth: options.shutterTimeGrowth ?? (refitMode ? 'run-mean' : 'bounded'),
  };
  const warnings: string[] = trace.warnings.map((w) => w.message);
  const { byDesign, seg, gathered } = basis;
  for (const w of seg.warnings) warnings.push(typeof w === 'string' ? w : w.message);
  // A start transient puts the fits on the exposure clock (fit/startTransient.ts); not inside
  // boundaries placed on the design's curve, which placed each start where the growth showed.
  // Turning-point cuts only (as the profiles): there the end thickness is the rate extrapolated
  // from the whole layer, which the start-up moves; a level cut's end sits on a slope that reads
  // it directly, and there the delay cost more than it gave (the sample four-layer AR, ramp 1.2 s,
  // refit: δ̂ 1.34 ± 0.46 s from two layers, n·d of layer 2 off by 1.13 % against 0.42 % without).
  const onClock = (l: number) => design.layers[l - 1]?.monitor.cut === 'turning-point' || (!!transient.levelOnClock && design.layers[l - 1]?.monitor.cut === 'level');
  // the layers whose σ takes the delay's (on its clock; at δ = 0, those that would be)
  const carriesDelay = (s: LayerSamples, l: number) => (transient.delayS > 0 ? (s.startDelayS ?? 0) > 0 : onClock(l));
  const samplesByLayer = transient.delayS > 0 && !byDesign
    ? new Map([...gathered].map(([l, s]) => [l, onClock(l) ? onExposureClock(s, transient.delayS) : s])) : gathered;
  // Boundaries placed on the design's curve (no layer column) already end where the growth after
  // the cut ended (placeBoundaries fits flat–growth–flat): no growth is added to them.
  for (const l of samplesByLayer.keys()) {
    if (l > design.layers.length) warnings.push(`the trace has layer ${l}, the design only ${design.layers.length}; ignored`);
  }
  const order = design.layers.filter((l) => samplesByLayer.has(l.layer)).sort((a, b) => samplesByLayer.get(a.layer)!.startTimeS - samplesByLayer.get(b.layer)!.startTimeS);
  assertEveryLayerSampled(design, samplesByLayer, seg.inferred);

  const mismatch = monitorWavelengthMismatch(trace.meta, order);
  if (mismatch) warnings.push(mismatch);
  warnings.push(...chipColumnWarnings(design, trace, samplesByLayer));

  // Spectra depend on each layer's samples only: with spectrumOf, all are asked for now.
  // …with the bin means the fits will take: the pass's three sizes and the final joint fit's.
  const binPoints = (layer: number) => {
    const chip = samplesByLayer.get(layer)!.chip;
    const onChip = order.filter((l) => samplesByLayer.get(l.layer)!.chip === chip && samplesByLayer.get(l.layer)!.tauS.length >= 10).length;
    return [o.maxFitPoints, o.refitPointsPerLayer, 150, finalPointsPerLayer(o, onChip)];
  };
  const spectra = o.spectrumOf ? requestSpectra(o.spectrumOf, design, trace, order, samplesByLayer, binPoints, transient.profiles !== undefined) : null;
  const { idleModel, noiseFloor } = basis.noise();
  const ends = byDesign ? null : new LayerEnds(trace, samplesByLayer, warnings, idleModel, o.shutterTimeGrowth, o.levelGrowthFromNext, o.shutterTimePopulation);
  const chipLayers = new Map<number, LayerState[]>();
  const chipStarts = calibrateChips(design, trace, order, samplesByLayer, warnings, o.fitOffset, o.offsetAdoptionSigma, o.offsetAveraging, o.unmeasuredOffsetSigma);
  // A layer the monitor did not see grow (no light, the wrong channel) fails the run, named, rather
  // than take a thickness read from a flat line (fit/layersSeen.ts).
  assertLayersSeen(design, trace, order, samplesByLayer, chipStarts);
  const calibrations = new Map([...chipStarts].map(([chip, c]) => [chip, c.calibration]));
  // A gain drift seen across the chips' bare-chip calibrations (at 3σ: with three chips the
  // slope's scatter has one degree of freedom) is applied within every chip.
  const drift = o.gainDriftFromChips ? gainDriftFromChips(chipStarts) : null;
  const knownDrift = drift && Math.abs(drift.driftPerS) > 3 * drift.sigmaPerS ? drift.driftPerS : 0;
  if (drift && knownDrift !== 0) {
    warnings.push(`detector gain drifting ${(knownDrift * 360000).toFixed(2)} % per hour (from the bare-chip calibrations of ${drift.chips} chips); applied within each chip`);
  }
  /** Chip-wide gain G·(1 + γ·t), t from the chip's first layer start (gain mode 'chip'). */
  // γ's prior from the lamp's stability (fit/gainDriftPrior.ts); fitted under it in refit mode with lampDriftFit.
  const driftPrior = !o.gainDrift && o.lampStabilityPerHour > 0 ? gainDriftPrior(o.lampStabilityPerHour, drift) : null;
  const fitLampDrift = driftPrior !== null && o.lampDriftFit && o.mode === 'refit';
  // Held instead (at the chips' drift when significant, else 0): the RMS error of the held value
  // under γ's prior goes into the layers' σ (fit/gainDriftSigma.ts).
  const heldDriftSigma = driftPrior && !fitLampDrift ? Math.hypot(driftPrior.sigmaPerS, driftPrior.meanPerS - knownDrift) : 0;
  const heldDrift = (chip: number): HeldDrift => transient.heldDrifts?.get(chip) ?? { perS: knownDrift, sigmaPerS: heldDriftSigma };
  const chipGain = new Map([...chipStarts].map(([chip, c]) => [chip, {
    gain: c.calibration.gain, driftPerS: fitLampDrift ? driftPrior.meanPerS : heldDrift(chip).perS, startS: c.startS,
    fitDrift: o.gainDrift || fitLampDrift, ...(fitLampDrift ? { driftPrior: { ...driftPrior } } : {}),
  }]));
  // A reflectance chip whose layers told its gain (fitted offset) holds it on every layer, σ carried
  // (fit/levelCutGain.ts holdsChipGain); not inside boundaries placed on the design's curve.
  const holdsGain = new Set([...chipStarts].filter(([, c]) => o.reflectanceChipGain && !byDesign && holdsChipGain(c.mode, c.calibration, o.gainPriorFraction)).map(([chip]) => chip));
  const heldGainFraction = (chip: number) => {
    const c = calibrations.get(chip)!;
    return holdsGain.has(chip) ? c.layerGainSigma! / Math.abs(c.gain) : 0;
  };
  const states: LayerState[] = [];
  const stacks = new Map<number, StackCovariance>();
  // Sequential: each chip's layers' shifts (n, d, stack order) under the held gain drift one σ higher,
  // each through the stack of the ones below (fit/stackUncertainty.ts shiftThroughStack).
  const driftShifts = new Map<number, Float64Array>();
  // The profiling pass reads the stack's σ only through a growth read from a layer's start, a
  // wander's choice or a thin layer's index prior (weighed by the σ of the layers before): without
  // those it carries no stack (its fits only build the stack each profile stands on).
  const stackRead = !transient.profiles || o.growthFromNext || o.rateWander
    || order.some((l) => (4 * indexAt(design.materials[l.material], l.monitor.wavelengthNm).re * l.thicknessNm) / l.monitor.wavelengthNm < o.thinLayerQwot || (o.heldIndexLevelCut && l.monitor.cut === 'level'));
  // The wander choices take the layers in order onto one variogram pool a pass. Where nothing
  // reads a choice before the pass's end (refit, the wander not fitted), wanderPrepOf may make
  // their pool-free part elsewhere while the fits go on; the pool's part is done here, in order.
  const noisePool = newVariogramPool();
  const prepElsewhere = o.mode === 'refit' && !o.rateWander ? o.wanderPrepOf : undefined;
  const laterChoices = new Map<{ state?: LayerState }, Promise<WanderPrep>>();
  /** The choices made elsewhere, finished in layer order up to the last of these layers (chip by chip: the first chips' joint fits go on meanwhile). */
  const tookChoices = async (layers: readonly LayerState[]) => {
    const wanted = new Set(layers);
    let left = [...laterChoices.keys()].filter((b) => wanted.has(b.state!)).length;
    for (const [built, prep] of laterChoices) {
      if (left === 0) break;
      const wander = finishRateWander(await prep, noisePool).wander;
      if (wander) built.state!.unmodelledWander = wander;
      if (wanted.has(built.state!)) left--;
      laterChoices.delete(built);
    }
  };
  // The start delay's profiles, chip by chip (each chip's layers in order, sent after its last).
  const profileChains = new Map<number, StartDelayLayerRequest[]>();
  const lastOfChip = new Map(order.map((l) => [samplesByLayer.get(l.layer)!.chip, l.layer]));
  const sendChain = (layers: StartDelayLayerRequest[]) => {
    const request = { layers };
    transient.profiles?.push(o.startDelayProfileOf ? o.startDelayProfileOf(request) : Promise.resolve(profileFromRequest(request)));
  };
  let done = 0;
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    const chip = samples.chip;
    const wl = dl.monitor.wavelengthNm;
    const optics: MonitorOptics = {
      ambient: indexAt(design.ambient, wl), substrate: indexAt(design.substrate, wl),
      backside: design.substrateBackside, wavelengthNm: wl, mode: dl.monitor.mode,
    };
    const prior = chipLayers.get(chip) ?? [];
    const below = prior.map((s) => layerAtWavelength(s.fit, s.estimate, wl));
    const calibration = calibrations.get(chip)!;
    const cg = chipGain.get(chip)!;
    const chipTimeS = samples.startTimeS - cg.startS;

    const model = design.materials[dl.material];
    const nominalAt = indexAtMemo(model);
    const nominal = nominalAt(wl);
    const qwotAtMonitor = (4 * nominal.re * dl.thicknessNm) / wl;
    // A thin layer gets a free trial fit; its index is held when that fit cannot separate it from the thickness.
    const thin = qwotAtMonitor < o.thinLayerQwot;
    // Thicker level-cut layers too (option heldIndexLevelCut): a cut near the layer's turning point leaves index and thickness as entangled as a thin layer's.
    const judged = thin || (o.heldIndexLevelCut && dl.monitor.cut === 'level');
    let heldIndex: number | null = null, heldNote: string | null = null, heldSigma = 0;
    const n = samples.tauS.length;
    if (n < 10) {
      warnings.push(`layer ${dl.layer}: only ${n} samples; not fitted`);
      continue;
    }
    const durationS = samples.tauS[n - 1];
    // (fit/requestSpectra.ts: which spectra the profiling pass reads)
    const { observed, binned: binnedElsewhere, ...spectrum }: LayerSpectrum & Partial<SampleWorkResult> = spectra ? await spectra.get(dl.layer)!
      : transient.profiles && qwotAtMonitor < PROFILE_PASS_SPECTRUM_QWOT ? { fringeFrequencyHz: null, fringeRateNmPerS: null, disturbances: [] }
      : layerSpectrum(samples.tauS, pick(trace.signal, samples.indices), wl, heldIndex ?? nominal.re);
    // A level cut's gain from the bare chip where that tells it well (fit/levelCutGain.ts); not
    // inside boundaries placed on the design's curve (no layer column), whose misplacement a
    // layer's own gain takes up (the AR without a layer column, 6 seeds: 1.32 % held, 0.61 % free).
    const levelGain = o.gain === 'per-layer' && o.levelCutGain === 'calibration' && !byDesign && holdsLevelCutGain(dl.monitor.cut, calibration, o.gainPriorFraction);
    // make() is called again after the pass (final refit), when the layer's state exists.
    const built: {
      state?: LayerState; wander?: RateWander; wanderVariance?: number; gradient?: boolean; unmodelled?: RateWander; unmodelledVariance?: WanderErrorVariance;
      scores?: { scores: WanderChoice['scores']; rateNmPerS: number; pointSigma: number }; wanderEvidence?: WanderEvidence<WanderErrorVariance>;
      driftShares?: { held: HeldIndexShift; chained: HeldIndexShift };
    } = {};
    const make = (maxPoints: number): FitLayerData => {
      // Bin means, not picked samples: every sample's information at a fraction of the points.
      const binned = binnedElsewhere?.find((b) => b.points === maxPoints) ?? binMeans(samples.tauS, samples.indices, trace.signal, maxPoints);
      return {
        optics, nominalAt, tauS: binned.tauS, y: binned.y, durationS: built.state?.fit.durationS ?? durationS,
        extinction: -nominal.im, heldIndex: built.state?.fit.heldIndex ?? heldIndex, fitDrift: built.state?.fit.fitDrift ?? qwotAtMonitor >= 0.5, weight: built.state?.weight ?? 1,
        heldGain: o.gain === 'chip' || levelGain || holdsGain.has(chip) ? cg.gain * (1 + cg.driftPerS * chipTimeS) : null, chipTimeS, gainDriftPerS: cg.driftPrior ? cg.driftPerS : heldDrift(chip).perS,
        // every key present (undefined when absent) and in one order: one object shape for V8 (layerModel.ts)
        wander: built.wander ? { ...built.wander, pointSigma: built.wander.pointSigma * Math.sqrt(binned.tauS.length / n) } : undefined,
        indexGradient: built.gradient ? 'fit' as const : undefined,
      };
    };
    const fit = make(o.maxFitPoints);
    const refit = make(o.refitPointsPerLayer);
    const grid = make(150);
    const gridInput = {
      gain: fit.heldGain ?? undefined, optics, below, extinction: -nominal.im, tauS: grid.tauS, y: grid.y, offsetSignal: calibration.offset,
      index: nominal.re, searchIndex: !thin, rateGuessNmPerS: dl.thicknessNm / Math.max(durationS, 1e-9),
    };
    let sv = startValues(gridInput);
    // The grid spans ±35 % of the design rate; a fringe rate well outside that widens the search.
    const fringeRate = spectrum.fringeRateNmPerS;
    if (fringeRate !== null && Math.abs(fringeRate / gridInput.rateGuessNmPerS - 1) > 0.2) {
      const alt = startValues({ ...gridInput, rateGuessNmPerS: fringeRate });
      if (alt.ssr < sv.ssr) sv = alt;
    }
    // Per-layer gains start at (and are held near, by a prior) the chip calibration.
    const anchor = cg.gain * (1 + cg.driftPerS * chipTimeS);
    const withPrior = o.gainPriorFraction > 0 && fit.heldGain === null;
    const gainPrior = withPrior ? { gainPrior: { fraction: o.gainPriorFraction, noiseSigma: noiseFloor.sigma ?? calibration.noiseSigma } } : {};
    const fitSingle = (index: number, rateNmPerS: number, gain: number, more: Partial<LayerParams> = {}) => fitLayers({
      fixedBelow: below, layers: [fit], offsetSignal: calibration.offset, start: [{ index, rateNmPerS, rateDriftNmPerS2: 0, gain, ...more }], ...gainPrior,
    }, { robust: o.robustLoss });
    /** The layer's own fit again from an estimate (its data as given, on a stack below), with the pass's gain start and prior. */
    const fitAgain = (layer: FitLayerData, e: LayerEstimate, on: readonly LayerAt[], maxIterations?: number) => fitLayers({
      fixedBelow: on, layers: [layer], offsetSignal: calibration.offset, start: [{ ...e, gain: fit.heldGain ?? (withPrior ? anchor : e.gain) }], ...gainPrior,
    }, { robust: o.robustLoss, ...(maxIterations ? { maxIterations } : {}) });
    let single = fitSingle(sv.index, sv.rateNmPerS, fit.heldGain ?? (withPrior ? anchor : sv.gain));
    // Held also when the data tell the index less well than the run's other layers of the material do.
    const indexPrior = judged && o.heldIndex === 'run-drift' ? driftEstimateAt(states.map(toIndexPoint), dl.material, samples.startTimeS) : null;
    const separation = judged ? indexSeparation(single, Math.min(o.heldIndexSigma, indexPrior?.sigma ?? NOMINAL_INDEX_SIGMA), o.heldIndexCorrelation) : null;
    if (separation?.hold) {
      heldIndex = nominal.re + (indexPrior?.deviation ?? 0);
      heldSigma = indexPrior?.sigma ?? NOMINAL_INDEX_SIGMA;
      heldNote = heldNoteFor(heldIndex, nominal.re, indexPrior?.from ?? 0, qwotAtMonitor, wl, false, separation.reason);
      fit.heldIndex = refit.heldIndex = heldIndex;
      fit.fitDrift = refit.fitDrift = false;
      const e = single.layers[0];
      single = fitSingle(heldIndex, e.rateNmPerS, fit.heldGain ?? e.gain);
    }
    // A linear index gradient through the layer, kept where the layer's own data tell it (fit/indexGradient.ts);
    // before the growth of the layer below is read from this layer's start, which a graded layer misreads when modelled uniform.
    let gradientTrial: GradientTrial | undefined;
    if (o.indexGradient && heldIndex === null && qwotAtMonitor >= GRADIENT_MIN_QWOT) {
      const e = single.layers[0];
      fit.indexGradient = 'fit';
      const trial = fitSingle(e.index, e.rateNmPerS, fit.heldGain ?? e.gain, { rateDriftNmPerS2: e.rateDriftNmPerS2, indexGradient: 0 });
      gradientTrial = judgeGradient(single, trial, GRADIENT_BOUND * nominal.re);
      if (gradientTrial.kept) {
        single = trial;
        built.gradient = true;
        refit.indexGradient = 'fit';
      } else delete fit.indexGradient;
    }
    // Without a layer column a turning-point cut ends where the fitted layer turns (fit/turningPointEnd.ts).
    if (byDesign && dl.monitor.cut === 'turning-point') {
      const endS = turningPointEndS(fit, single.layers[0], below);
      if (endS !== null) {
        fit.durationS = refit.durationS = endS;
        const e = single.layers[0];
        single = fitSingle(e.index, e.rateNmPerS, fit.heldGain ?? (withPrior ? anchor : e.gain), { rateDriftNmPerS2: e.rateDriftNmPerS2, indexGradient: e.indexGradient });
      }
    }
    const c = withPrior ? (noiseFloor.sigma ?? calibration.noiseSigma) / (o.gainPriorFraction * Math.abs(anchor)) : 0;
    // The growth after the cut of the layer below, from where this layer starts on its fringe (LayerEnds).
    if (o.growthFromNext && ends?.fromNext(chip, below, fit, single, calibration.offset, c, stacks.get(chip))) {
      const e = single.layers[0];
      single = fitSingle(e.index, e.rateNmPerS, fit.heldGain ?? (withPrior ? anchor : e.gain), { indexGradient: e.indexGradient });
      // the stack below moved: a kept gradient must still stand on it
      if (gradientTrial?.kept) {
        gradientTrial = reviewGradient(single, GRADIENT_BOUND * nominal.re);
        if (!gradientTrial.kept) {
          delete fit.indexGradient;
          delete refit.indexGradient;
          built.gradient = false;
          const u = single.layers[0];
          single = fitSingle(u.index, u.rateNmPerS, fit.heldGain ?? (withPrior ? anchor : u.gain), { rateDriftNmPerS2: u.rateDriftNmPerS2 });
        }
      }
    }
    if (transient.profiles && !byDesign) {
      // This layer in its chip's chain of profiles in the run's start delay, each layer refitted at
      // every δ on the layers below refitted at that δ (fit/startDelayChain.ts); its χ² counted
      // where it is a turning-point cut with its index fitted. Sent when the chip's last layer is
      // fitted, computed where startDelayProfileOf puts it (e.g. the second thread) while this one fits on.
      const e = single.layers[0];
      const real = gathered.get(dl.layer)!;
      const profiled = !separation?.hold && fit.fitDrift && dl.monitor.cut === 'turning-point';
      const growth = profiled && heldIndex === null ? ends?.growthBelow(chip) : null;
      const chain = profileChains.get(chip) ?? [];
      chain.push(startDelayLayerRequest({
        below: below.slice(), start: e, offsetSignal: calibration.offset, onClock: onClock(dl.layer), profiled,
        ...(growth ? { growthBelow: { heldNm: growth.deltaNm, rateNmPerS: growth.rateNmPerS } } : {}),
        ...gainPrior,
      }, { ...fit, durationS: real.tauS[real.tauS.length - 1] }, model, real.tauS, sampleReadings(trace.signal, real.indices)));
      profileChains.set(chip, chain);
      if (lastOfChip.get(chip) === dl.layer) {
        profileChains.delete(chip);
        sendChain(chain);
      }
    }
    // Not inside boundaries placed on the design's curve (no layer column): those were placed with a
    // steady rate, and the knots then take up the placement's error (measured on the no-layer
    // scenarios: 1.1 → 1.9 % sequential).
    const wanderAsked = o.rateWander || (o.wanderSigma && !transient.profiles);
    if (wanderAsked && !byDesign && !separation?.hold && fit.fitDrift && dl.monitor.cut === 'turning-point') {
      // A rate that wanders within the layer: more freedom where the data ask for it (fit/wanderChoice.ts).
      // Turning-point cuts only: there the end thickness is the rate extrapolated over the flat top,
      // which a wander moves; a level cut's end sits on a slope that reads it directly, and there
      // the knots took up calibration misfit instead (chamber BBAR, demo BBAR: cut errors at |z| ≈ 10).
      const e = single.layers[0];
      const input = {
        below, layer: fit, estimate: e, offsetSignal: calibration.offset, allTauS: samples.tauS, allY: sampleReadings(trace.signal, samples.indices),
        gainPriorSigma: withPrior ? o.gainPriorFraction * Math.abs(anchor) : 0,
        ...(stacks.has(chip) ? { stack: ends ? ends.stackWithGrowth(chip, stacks.get(chip)!) : stacks.get(chip)! } : {}),
        growthFromHere: o.growthFromNext && !!ends && below.length > 0,
      };
      if (prepElsewhere) laterChoices.set(built, prepElsewhere(wanderChoiceRequest(input, model)));
      else {
        const choice = chooseRateWander({ ...input, noisePool });
        if (o.rateWander && o.mode === 'refit' && !transient.profiles) {
          built.wanderEvidence = { material: dl.material, scores: choice.scores, rateNmPerS: e.rateNmPerS, durationS: fit.durationS, pointSigma: choice.sampleSigma, own: !!choice.wander };
        }
        if (!o.rateWander && o.mode === 'sequential') built.scores = { scores: choice.scores, rateNmPerS: e.rateNmPerS, pointSigma: choice.sampleSigma };
        if (choice.wander && !o.rateWander) built.unmodelled = choice.wander;
        else if (choice.wander) {
          built.wander = choice.wander;
          const pointSigma = (count: number) => choice.wander!.pointSigma * Math.sqrt(count / n);
          fit.wander = { ...choice.wander, pointSigma: pointSigma(fit.tauS.length) };
          refit.wander = { ...choice.wander, pointSigma: pointSigma(refit.tauS.length) };
          single = fitSingle(e.index, e.rateNmPerS, e.gain, { rateDriftNmPerS2: e.rateDriftNmPerS2, indexGradient: e.indexGradient });
          built.wanderVariance = wanderEndVariance(fit, single.solver.covariance);
        }
      }
    }
    if (o.mode === 'sequential' && stackRead) {
      // The stack below's uncertainty, carried into this layer's σ (refit fits them jointly instead).
      let stackPrior = ends ? ends.stackWithGrowth(chip, stacks.get(chip) ?? emptyStack()) : stacks.get(chip) ?? emptyStack();
      // The stack below read again with this layer's data (option stackFromLayer, fit/stackPosterior.ts):
      // the layers below moved to the posterior, this one fitted on them, the posterior carried instead.
      // Level cuts in reflectance only: there the stack's admittance sets where the level falls on
      // the layer's fringe; elsewhere the layers' own data carried it less than they carried what
      // the model lacks (every layer read so: real-chamber BBAR in T, seeds 21–36, RMS 1.07 → 1.94 %;
      // R with an offset, turning-point cuts, seeds 51–66, max 1.02 → 2.20 %).
      let readStack = false;
      if (o.stackFromLayer && dl.monitor.cut === 'level' && dl.monitor.mode === 'R' && !transient.profiles && stackPrior.size > 0 && stackPrior.size === 2 * below.length) {
        // what the pass holds with a σ, each one σ off: the chip's gain drift, its held gain, its offset
        const nuisances: Nuisance[] = [];
        const hd = heldDrift(chip);
        if (hd.sigmaPerS > 0) {
          const g = hd.perS + hd.sigmaPerS;
          nuisances.push({ layer: { ...fit, gainDriftPerS: g, heldGain: fit.heldGain !== null ? cg.gain * (1 + g * chipTimeS) : null }, offsetSignal: calibration.offset });
        }
        const gf = heldGainFraction(chip);
        if (gf > 0 && fit.heldGain !== null) nuisances.push({ layer: { ...fit, heldGain: fit.heldGain * (1 + gf) }, offsetSignal: calibration.offset });
        const so = chipStarts.get(chip)!.offsetSigmaRandom ?? 0;
        if (so > 0) {
          const dGain = (chipStarts.get(chip)!.offsetGainSlope ?? 0) * so * (1 + cg.driftPerS * chipTimeS);
          nuisances.push({ layer: { ...fit, heldGain: fit.heldGain !== null ? fit.heldGain + dGain : null }, offsetSignal: calibration.offset + so });
        }
        const read = readStackWithLayer(prior, below, fit, single, stackPrior, calibration.offset, c, (b, e) => fitAgain(fit, e, b), nuisances);
        if (read) {
          single = read.fit;
          stackPrior = read.stack;
          readStack = true;
        }
      }
      const held = heldIndex !== null ? { sigma: heldSigma, shift: shiftWithHeldIndex(fit, heldIndex, heldSigma, single.layers[0], fitSingle) } : null;
      const stack = carryStackUncertainty(below, fit, single.layers[0], single.solver.params, single.solver.covariance, calibration.offset, stackPrior, c, held);
      stacks.set(chip, stack);
      // The layer below's σ as the stack took it (stackWithGrowth) holds its gain drift share: what that brought this layer.
      const top = ends ? prior[prior.length - 1] : undefined;
      const topDrift = top?.gainDriftShares && stack.sensitivity ? driftShareThroughStack(stack, top.gainDriftShares, top.estimate.thicknessSigmaNm, single.layers[0]) : null;
      // The gain drift held within the layer: its prior σ into the layer's σ (fit/gainDriftSigma.ts).
      // (σ only: not in the profiling pass, whose fits only build the stack each profile stands on)
      if (heldDrift(chip).sigmaPerS > 0 && !transient.profiles) {
        const { perS, sigmaPerS } = heldDrift(chip);
        const e = single.layers[0];
        const own = carryGainDriftSigma(fit, e, perS, sigmaPerS, (g) => cg.gain * (1 + g * chipTimeS), (index, rate, gain) => fitSingle(index, rate, gain));
        const carried = own && topDrift ? { index: Math.hypot(own.index, topDrift.index), thicknessNm: Math.hypot(own.thicknessNm, topDrift.thicknessNm), opticalNm: Math.hypot(own.opticalNm, topDrift.opticalNm) } : own;
        // What is reported in its place after the pass (the pass goes on with the σ above, fit/gainDriftSigma.ts
        // swapGainDriftShare): a chip gain held from the offset's profile moves with the drift as that
        // fit does, and the offset with it (fit/fittedOffsets.ts); and the drift is the chip's, so the
        // layers below moved with it, and this one with them through the stack.
        const response = holdsGain.has(chip) ? chipStarts.get(chip)!.gainDrift?.() ?? undefined : undefined;
        const direct = response ? gainDriftShift(fit, e, perS, sigmaPerS, (g) => (cg.gain + response.gainPerDrift * (g - perS)) * (1 + g * chipTimeS), (index, rate, gain) => fitLayers({
          fixedBelow: below, layers: [fit], offsetSignal: calibration.offset + response.offsetPerDrift * sigmaPerS, start: [{ ...e, index, rateNmPerS: rate, gain }],
        }, { robust: o.robustLoss, maxIterations: 30 }))?.shift ?? null : own;
        const shifts = driftShifts.get(chip) ?? new Float64Array(0);
        const through = direct ? shiftThroughStack(stack, shifts, e.index, e.thicknessNm) : null;
        const chained = direct && through ? { index: direct.index + through.index, thicknessNm: direct.thicknessNm + through.thicknessNm, opticalNm: direct.opticalNm + through.opticalNm } : direct;
        driftShifts.set(chip, Float64Array.from([...shifts, chained?.index ?? 0, chained?.thicknessNm ?? 0]));
        // (not where the stack was read with this layer: its posterior took the drift as a direction of its own, and the share stays as carried)
        if (carried && chained && !readStack) built.driftShares = { held: carried, chained };
      }
      // A chip gain held from the offset's profile: its σ into the layer's σ (fit/heldGainSigma.ts).
      if (!transient.profiles) {
        const e = single.layers[0];
        carryHeldGainSigma([fit], [e], heldGainFraction(chip), ([moved]) => fitLayers({
          fixedBelow: below, layers: [moved], offsetSignal: calibration.offset, start: [{ ...e, gain: moved.heldGain ?? e.gain }],
        }, { robust: o.robustLoss, maxIterations: 30 }));
      }
      // A wander the plain law does not follow: its cost, added to σ once the pass is done
      // (fit/wanderSigma.ts; the pass weighs later readings by the layers' σ as they stand).
      // sequential only: in refit the chip's final joint fit carries it
      if (built.unmodelled && o.mode === 'sequential') built.unmodelledVariance = wanderErrorVariances(below, [fit], single, calibration.offset, [built.unmodelled], null)?.[0];
      if (built.scores && !transient.profiles) {
        // Every layer's choice joins its material's shared wander (fit/pooledWander.ts), known after
        // the pass; a layer whose own choice kept none takes that wander's cost on its fit as it stands now.
        const [fitNow, belowNow, fitted] = [{ ...fit }, below.slice(), single];
        built.wanderEvidence = {
          material: dl.material, ...built.scores, durationS: fitNow.durationS, own: !!built.unmodelled,
          cost: (w) => wanderErrorVariances(belowNow, [fitNow], fitted, calibration.offset, [w], null)?.[0] ?? null,
        };
      }
      if (transient.sigmaS && !byDesign) {
        const e = single.layers[0];
        carryStartDelaySigma([fit], [e], transient.delayS, transient.sigmaS, [carriesDelay(samples, dl.layer)], ([moved]) => fitAgain(moved, e, below, 30));
      }
    }
    // A layer the smooth-rate model does not follow (rate spike, jump) counts less in joint fits.
    const ratio = noiseFloor.sigma ? single.solver.residualRms / noiseFloor.sigma : 1;
    const weight = ratio > o.residualWarnFactor ? 1 / ratio : 1;
    refit.weight = weight;
    const state: LayerState = {
      weight, qwotAtMonitor, design: dl, samples, optics, nominal, fit, refit, make, estimate: single.layers[0], iterations: single.solver.iterations, fitPoints: fit.tauS.length,
      converged: single.solver.converged, wellDetermined: single.solver.wellDetermined, heldNote, calibration, spectrum, ...(observed ? { observed } : {}),
      ...(separation?.hold ? { heldWhy: separation.reason, heldIndexSigma: heldSigma } : {}),
      ...(built.wanderVariance !== undefined ? { wanderVarianceNm2: built.wanderVariance } : {}),
      ...(built.unmodelled ? { unmodelledWander: built.unmodelled } : {}),
      ...(built.unmodelledVariance ? { unmodelledVariance: built.unmodelledVariance } : {}),
      ...(built.wanderEvidence ? { wanderEvidence: built.wanderEvidence } : {}),
      ...(built.driftShares ? { gainDriftShares: { ...built.driftShares, atFit: { index: single.layers[0].indexSigma, thicknessNm: single.layers[0].thicknessSigmaNm, opticalNm: single.layers[0].opticalThicknessSigmaNm } } } : {}),
      ...(gradientTrial ? { gradientTrial } : {}),
    };
    built.state = state;
    if (o.mode === 'sequential' && o.offsetAveraging) {
      // the gain moves with the offset: the bare reading's (B − o)/M₀, or along a reflectance chip's profile
      const slope = chipStarts.get(chip)!.offsetGainSlope ?? 0;
      state.offsetAgain = (on, e, dOffset) => {
        const dGain = slope * dOffset * (1 + cg.driftPerS * chipTimeS);
        const heldGain = fit.heldGain !== null ? fit.heldGain + dGain : null;
        return fitLayers({
          fixedBelow: on, layers: [{ ...fit, heldGain }], offsetSignal: calibration.offset + dOffset,
          start: [{ ...e, gain: heldGain ?? (withPrior ? anchor + dGain : e.gain + dGain) }], ...gainPrior,
        }, { robust: o.robustLoss, maxIterations: 30 });
      };
    }
    if (o.mode === 'sequential' && o.fitWithNextLayer) {
      state.pairPart = {
        startGain: (e) => fit.heldGain ?? (withPrior ? anchor : e.gain), ...gainPrior,
        ...(driftPrior ? { lampDrift: { chipGain: cg.gain, chipGainSigma: calibration.gainSigma, prior: driftPrior, noiseSigma: noiseFloor.sigma ?? calibration.noiseSigma } } : {}),
      };
    }
    if (o.mode === 'sequential' && ends && o.fitOnFinalStack) {
      state.fittedOn = {
        below: below.slice(),
        again: (b, e) => fitAgain(fit, e, b),
      };
    }
    if (built.wanderEvidence && !built.wander) {
      state.takeWander = (w) => {
        built.wander = w;
        state.fit.wander = { ...w, pointSigma: w.pointSigma * Math.sqrt(state.fit.tauS.length / n) };
        state.refit.wander = { ...w, pointSigma: w.pointSigma * Math.sqrt(state.refit.tauS.length / n) };
      };
    }
    ends?.ended(state, below);
    prior.push(state);
    chipLayers.set(chip, prior);
    states.push(state);
    if (o.mode === 'refit' && o.refitPointsPerLayer > 0 && (prior.length > 1 || o.gain === 'chip')) {
      refitChip(prior.map((p) => p.refit), prior, calibration.offset, false, o.gain === 'chip' && !holdsGain.has(chip) ? cg : null, o.robustLoss);
    }
    done++;
    o.onProgress?.(done, order.length);
    if (done % 4 === 0) await Promise.resolve();
  }

  // (a chip whose last layer had too few samples to fit: its chain is sent here)
  for (const chain of profileChains.values()) sendChain(chain);
  if (transient.profiles) return null;
  // Each chip's unmodelled-wander variances (refit), in chip order: added to σ after the last chip's fit.
  const chipWanderVariances: { chipStates: LayerState[]; variances: WanderErrorVariance[] | null | PromiseLike<WanderErrorVariance[] | null> }[] = [];
  if (o.mode === 'refit') {
    // Thin layers: hold at the drift estimate from the whole run, then one final joint fit per chip.
    if (o.heldIndex === 'run-drift') holdAtRunDrift(states, states);
    if (o.rateWander) {
      // A layer whose own choice kept no wander takes its material's shared one (fit/pooledWander.ts):
      // the wander is in every layer, and a choice that keeps the plain law only lacks the evidence.
      const chose = states.filter((s) => s.wanderEvidence);
      sharedWanders(chose.map((s) => s.wanderEvidence!)).forEach((w, j) => {
        if (w) chose[j].takeWander!(w);
      });
    }
    for (const [chip, chipStates] of chipLayers) {
      const perLayer = finalPointsPerLayer(o, chipStates.length);
      const cg = o.gain === 'chip' && !holdsGain.has(chip) ? chipGain.get(chip)! : null;
      // no layer ending before its last logged sample (LayerEnds)
      ends?.beforeJointFit(chipStates);
      const data = chipStates.map((p) => p.make(perLayer));
      const joint = refitChip(data, chipStates, chipStates[0].calibration.offset, true, cg, o.robustLoss, o.holdUncarriedDrift);
      // Without a layer column each turning-point cut's end is read again on the joint fit, its
      // thickness there; not fitted again (fit/turningPointEnd.ts: a refit bends the ends off the turning points).
      const estimates = chipStates.map((p) => p.estimate);
      if (byDesign && turningPointEndsOnChip(data, estimates, chipStates.map((p) => p.design.monitor.cut === 'turning-point'))) {
        chipStates.forEach((p, j) => {
          p.fit.durationS = p.refit.durationS = data[j].durationS;
          p.estimate = estimates[j];
        });
      }
      const shared = joint.sharedGain;
      if (transient.jointProfiles) {
        // δ profiled in this joint fit, the gain drift refitted at every δ (fit/jointStartDelay.ts)
        const profile = cg?.fitDrift ? jointStartDelayProfile({
          layers: data, binsAt: chipStates.map((p) => binsOnExposureClocks(p.samples.tauS, p.samples.indices, trace.signal, perLayer)),
          onClock: chipStates.map((p) => p.design.monitor.cut === 'level'), start: chipStates.map((p) => p.estimate),
          offsetSignal: chipStates[0].calibration.offset, sharedGain: cg, robust: o.robustLoss,
        }) : null;
        if (profile) transient.jointProfiles.push({ chip, profile });
        continue;
      }
      // Each growth after a cut read again against the jointly fitted stack (LayerEnds), a wander's
      // knots free under their prior (fit/jointGrowth.ts).
      ends?.afterJointFit(data, chipStates, chipStates[0].calibration.offset, cg);
      // A held index's own σ, into every layer of the chip (the joint fit took the index as exact).
      heldIndexSigmaIntoChip(data, chipStates, cg, o.robustLoss);
      // A time base the joint fit took as exact, its σ into the layers that stand on it: a growth
      // after a cut that the fit held; without a layer column (no growths there), a level cut's
      // placed end as far as its readings allow it to move, the layer's own thickness moving too
      // (no-layer-column BBAR seeds 101–112, thickness within 3σ 97.9 → 100 %, RMS z_d 0.76 → 0.58).
      heldGrowthSigmaIntoChip(data, chipStates, ends ? ends.heldGrowths(chipStates) : chipStates.map((p) => placedSpreadS(basis.placed, p).endS || null), cg, o.robustLoss, !ends);
      const cal = calibrations.get(chip)!;
      carryOffsetSigma(data, chipStates.map((p) => p.estimate), cal.offset, chipStarts.get(chip)!.offsetSigmaRandom ?? cal.offsetSigma, cg, o.robustLoss, joint);
      const driftMoved = carryJointGainDriftSigma(data, chipStates.map((p) => p.estimate), cal.offset, heldDriftSigma, cg, o.robustLoss, joint);
      driftMoved?.forEach((shift, j) => (chipStates[j].lampDriftShift = shift));
      carryHeldGainSigma(data, chipStates.map((p) => p.estimate), heldGainFraction(chip), (moved) => fitLayers(
        { fixedBelow: [], layers: moved, start: chipStates.map((p) => p.estimate), offsetSignal: cal.offset }, { robust: o.robustLoss, maxIterations: 30 },
      ));
      await tookChoices(chipStates);
      if (chipStates.some((p) => p.unmodelledWander)) {
        // each layer's unmodelled wander, through the chip's final joint fit (fit/wanderSigma.ts):
        // asked for now (elsewhere, where wanderVariancesOf is given), added to σ once every chip is fitted
        const request = wanderVariancesRequest(data, chipStates.map((p) => design.materials[p.design.material]), joint, cal.offset, chipStates.map((p) => p.unmodelledWander ?? null), cg);
        if (request) chipWanderVariances.push({ chipStates, variances: o.wanderVariancesOf ? o.wanderVariancesOf(request) : wanderVariancesFromRequest(request) });
      }
      if (transient.sigmaS && !byDesign) {
        // to the ends the growths after the cuts put on the layers (LayerEnds), as their estimates now stand
        const ended = data.map((d, j) => ({ ...d, durationS: chipStates[j].fit.durationS }));
        carryJointStartDelaySigma(ended, chipStates.map((p) => p.estimate), cal.offset, transient.delayS, transient.sigmaS, chipStates.map((p) => carriesDelay(p.samples, p.design.layer)), cg, o.robustLoss, joint);
      }
      if (shared) {
        cal.refinedGain = shared.gain;
        cal.refinedGainSigma = shared.gainSigma;
        if (cg?.fitDrift) {
          cal.gainDriftPerHour = shared.driftPerS * 3600;
          cal.gainDriftSigmaPerHour = shared.driftSigmaPerS * 3600;
        }
      }
    }
  }

  if (transient.jointProfiles) return null;
  for (const { chipStates, variances } of chipWanderVariances) (await variances)?.forEach((x, j) => addWanderVariance(chipStates[j].estimate, x));
  ends?.finish(o.mode === 'refit');
  if (o.mode === 'sequential' && o.fitWithNextLayer) {
    // Sequential: a held thin level cut's index from the whole run (each level cut is fitted again
    // in the window it starts), then each level cut fitted again with the next two layers on its
    // chip, on the stack as it now stands (fit/fitWithNextLayer.ts); the other layers as fitOnFinalStack has them.
    if (o.heldIndex === 'run-drift') holdAtRunDrift(states, states.filter((s) => s.design.monitor.cut === 'level' && s.pairPart));
    // (a chip whose windows show the rate's start-up as the shutter opens reads them on its clock)
    const startUps = fitWithNextLayers(chipLayers, o.robustLoss, (s, below) => {
      if (ends && o.fitOnFinalStack) fitOnFinalStack(s, below);
    });
    if (o.heldIndex === 'run-drift') {
      // Each held thin level cut's index once more from the whole run, now from the layers as the
      // windows left them, and its own window fitted again (fit/fitWithNextLayer.ts fitHeldAgain);
      // put back where no window could be fitted.
      const held = states.filter((s) => s.design.monitor.cut === 'level' && s.pairPart && s.fit.heldIndex !== null);
      const back = new Map(held.map((s) => [s, passedState(s)]));
      holdAtRunDrift(states, held);
      const again = fitHeldAgain(chipLayers, o.robustLoss, new Set(held), startUps);
      held.forEach((s) => { if (!again.has(s)) back.get(s)!(); });
    }
  } else if (o.mode === 'sequential' && ends && o.fitOnFinalStack) {
    // Sequential: the layers whose stack below the growths' final reading moved, fitted again on it.
    fitOnFinalStacks(chipLayers);
  }
  /** The layers below s on its chip, as they stand now, at s's monitor wavelength. */
  const belowOf = (s: LayerState) => {
    const chipStates = chipLayers.get(s.samples.chip)!;
    return chipStates.slice(0, chipStates.indexOf(s)).map((p) => layerAtWavelength(p.fit, p.estimate, s.optics.wavelengthNm));
  };
  // A chip's last layer cut at a turning point, whose end nothing above pins: at or past its fitted
  // turning point at the last logged sample (option cutPastTurningPoint, fit/cutPastTurningPoint.ts).
  if (ends && (o.cutPastTurningPoint === true || (o.cutPastTurningPoint === 'refit' && o.mode === 'refit'))) {
    // A turning-point cut's logged end and the turning point near it, on the layer's fitted law.
    const loggedEnd = (s: LayerState) => {
      if (s.design.monitor.cut !== 'turning-point' || s.fit.heldIndex !== null) return null;
      const cut = ends.loggedCut(s);
      if (!cut || !(cut.sigmaNm > 0)) return null;
      const e = s.estimate, w = e.wander ? s.fit.wander : undefined;
      const loggedNm = lawThickness(e, w, cut.loggedS);
      const tpNm = turningPointNearNm(s.optics, belowOf(s), e.index, -s.nominal.im, loggedNm);
      return tpNm === null ? null : { cut, e, w, loggedNm, tpNm };
    };
    // The σ of the end relative to the turning point, on the fit's own covariance of d and n (the
    // layer's fit in sequential, the chip's joint fit in refit; fit/cutPastTurningPoint.ts
    // relativeCut); the whole σ holds the stack below's and the offset's shares, which move the
    // end and its turning point together. In refit the whole σ stood until this was measured
    // there too: on analysis/synth's 18-layer mirror (overshoot 0.1–0.6 %), seeds 11–30, the
    // chips' last layers read 2× their error's spread (σ 0.2–0.3 % for errors of RMS 0.11 %), so
    // the run's overshoot population took them over (RMS 0.087 → 0.142 %); on the relative σ
    // 0.089 %. Harness seeds, refit: rate-wander mirror 1.33 → 0.70 % (the last cut's σ now
    // within the overshoot, overshootSeen), with the population spikes mirror 0.57 → 0.18 %.
    const relativeReading = (s: LayerState, e: LayerState['estimate'], loggedNm: number) => {
      const own = e.ownCovariance;
      if (!own) return null;
      const h = Math.max(Math.sqrt(own.nn), 1e-4);
      const up = turningPointNearNm(s.optics, belowOf(s), e.index + h, -s.nominal.im, loggedNm);
      const down = turningPointNearNm(s.optics, belowOf(s), e.index - h, -s.nominal.im, loggedNm);
      return up !== null && down !== null ? relativeCut(own, (up - down) / (2 * h)) : null;
    };
    // The run's overshoot from its other turning-point cuts, each end pinned by the layer above
    // (option overshootPopulation; 'uniform' keeps the uniform prior alone).
    const maxPct = Math.max(o.turningPointOvershootPct, 0);
    const readings: { timeS: number; sigmaS: number }[] = [];
    if (maxPct > 0 && o.overshootPopulation !== 'uniform') {
      for (const chipStates of chipLayers.values()) for (const s of chipStates.slice(0, -1)) {
        const end = loggedEnd(s);
        if (!end || !(end.tpNm > 0)) continue;
        const sigmaNm = relativeReading(s, end.e, end.loggedNm)?.sigmaNm ?? end.cut.sigmaNm;
        readings.push({ timeS: (100 * (end.loggedNm - end.tpNm)) / end.tpNm, sigmaS: (100 * sigmaNm) / end.tpNm });
      }
    }
    const pop = readings.length >= 3 ? truncatedPopulation(readings, maxPct) : null;
    const run: RunOvershoot | null = pop
      ? { meanPct: pop.meanS, spreadPct: pop.spreadS, ...(o.overshootPopulation === 'mixture' ? { components: populationMixture(readings, maxPct) } : {}) }
      : null;
    for (const chipStates of chipLayers.values()) {
      const s = chipStates[chipStates.length - 1];
      const end = loggedEnd(s);
      if (!end) continue;
      const { cut, e, w, loggedNm, tpNm } = end;
      let shiftNm = cutPastTurningPointNm(loggedNm, cut.sigmaNm, tpNm, o.turningPointOvershootPct, run) - loggedNm;
      let seen = { sigmaNm: cut.sigmaNm, beta: 1 };
      // The posterior on the end relative to the turning point (relativeReading), where the
      // reading does not contradict the prior on the whole σ (the gate above).
      if (shiftNm !== 0) {
        const rel = relativeReading(s, e, loggedNm);
        // beta held within [0, 1]: the end moved no further than the relative reading (beta read
        // 1.2–1.3 on the spikes mirror; held, its chips' last layers RMS 0.402 → 0.373 %, seeds 15–30).
        if (rel) {
          seen = { sigmaNm: rel.sigmaNm, beta: Math.min(Math.max(rel.beta, 0), 1) };
          shiftNm = relativeCutShiftNm(loggedNm, tpNm, seen.sigmaNm, seen.beta, o.turningPointOvershootPct, run);
        }
      }
      // Only where that σ could show a cut later than the overshoot allows (overshootSeen).
      const hiNm = (tpNm * maxPct) / 100;
      if (!overshootSeen(seen.sigmaNm, hiNm)) shiftNm = 0;
      if (shiftNm === 0) continue;
      const d = e.thicknessNm + shiftNm;
      const T = lawTimeToThickness(e, w, d, s.fit.durationS);
      if (Number.isFinite(T)) s.fit.durationS = s.refit.durationS = T;
      // What the prior told of x leaves the end's variance (endSigmaAfterPrior); n·d's with it.
      const post = overshootPosterior(loggedNm - tpNm, seen.sigmaNm, hiNm, tpNm, run).sigma;
      const sd = endSigmaAfterPrior(e.thicknessSigmaNm, seen.sigmaNm, seen.beta, post);
      const snd = e.index * endSigmaAfterPrior(e.opticalThicknessSigmaNm / e.index, seen.sigmaNm, seen.beta, post);
      s.estimate = { ...e, thicknessNm: d, opticalThicknessNm: e.index * d, thicknessSigmaNm: sd, opticalThicknessSigmaNm: snd };
    }
  }
  // A turning-point cut ended on its fitted turning point (no layer column): the excess past it,
  // which the trace does not show, and the excess of the layer below, which moved its turning
  // point, moved by their mean into the estimate and their variance into σ, or (option
  // turningPointExcessMean off) their mean square about the turning point into σ alone
  // (fit/turningPointExcess.ts).
  if (byDesign) {
    // Its σ first, bottom up on each chip: the turning point's, not the rate law's at a fixed end (turningPointEndSigma).
    for (const chipStates of chipLayers.values()) {
      chipStates.forEach((s, j) => {
        if (s.design.monitor.cut !== 'turning-point') return;
        const below = belowOf(s);
        if (turningPointEndS(s.fit, s.estimate, below) === null) return;
        const sigmaBelow = chipStates.slice(0, j).map((p) => ({ thicknessNm: p.estimate.thicknessSigmaNm, index: p.estimate.indexSigma }));
        const sigma = turningPointEndSigma(s.fit, s.estimate.index, s.estimate.indexSigma, below, sigmaBelow, s.estimate.thicknessNm);
        if (sigma) s.estimate = { ...s.estimate, thicknessSigmaNm: sigma.thicknessNm, opticalThicknessSigmaNm: sigma.opticalThicknessNm };
      });
    }
    // Sequential: a level cut's placed end, and any layer's placed start, as far as the readings
    // allow them to move (levelCutEnds' spread), into σ: a layer fitted alone ends where its end
    // was placed, and to first order its thickness moves by the rate there. (Refit carries the
    // ends through each chip's joint fit instead, where the layers above read the stack again: this
    // first-order move there overstated σ threefold, no-layer-column BBAR seeds 101–112 RMS z_d
    // 0.76 → 0.27.)
    if (o.mode === 'sequential') {
      for (const s of states) {
        const { endS, startS } = placedSpreadS(basis.placed, s);
        s.estimate = withWanderVariance(s.estimate, (lawRate(s.estimate, s.fit.wander, s.fit.durationS) * endS) ** 2 + (lawRate(s.estimate, s.fit.wander, 0) * startS) ** 2);
      }
    }
    const excess = new Map<LayerState, TurningPointExcess>();
    for (const s of states) if (s.design.monitor.cut === 'turning-point') excess.set(s, turningPointExcess(s.fit, s.estimate, o.turningPointOvershootPct));
    for (const s of states) {
      const own = excess.get(s);
      if (!own) continue;
      const chipStates = chipLayers.get(s.samples.chip)!;
      const j = chipStates.indexOf(s);
      const under = j > 0 ? excess.get(chipStates[j - 1]) ?? null : null;
      const c = under ? turningPointCompensation(s.fit, s.estimate.index, belowOf(s), s.estimate.thicknessNm) : null;
      if (!o.turningPointExcessMean) {
        s.estimate = withWanderVariance(s.estimate, excessErrorMeanSquare(own, under, c));
        continue;
      }
      const shiftNm = excessMeanShiftNm(own, under, c);
      const e = { ...s.estimate, thicknessNm: s.estimate.thicknessNm + shiftNm, opticalThicknessNm: s.estimate.opticalThicknessNm + s.estimate.index * shiftNm };
      s.estimate = withWanderVariance(e, excessErrorVariance(own, under, c));
    }
  }
  if (o.mode === 'sequential') {
    // A layer whose own choice kept no wander takes its material's shared one (fit/pooledWander.ts).
    const chose = states.filter((s) => s.wanderEvidence);
    sharedWanderCosts(chose.map((s) => s.wanderEvidence!)).forEach((v, j) => {
      if (v) chose[j].unmodelledVariance = v;
    });
    for (const s of states) if (s.unmodelledVariance) addWanderVariance(s.estimate, s.unmodelledVariance);
  }
  // Noise reference: the idle stretches when they are long enough, else the run's typical layer residual.
  // It is the whole noise, white and correlated: a layer's residuals over many correlation times
  // carry both, and against the white part alone every layer of a lock-in's trace read 2–3× "noisy".
  let reference = noiseFloor.samples >= 1000 ? (idleModel ? Math.sqrt(idleModel.whiteVar + idleModel.ar1Var) : noiseFloor.sigma) : null;
  if (reference === null && states.length >= 3) {
    reference = median(states.map((s) => layerResult(s, belowOf(s), trace, 1, o).residualRms * s.estimate.gain));
  }
  // With one or two layers and a short idle stretch, the idle model (white + AR(1)) from 100 lit
  // samples on, not the white part alone: a 20 s bare-chip stretch at 10 Hz read only that, and the
  // demo's clean single-layer run then read "residuals 1.8×".
  if (reference === null && idleModel && noiseFloor.samples >= 100) reference = Math.sqrt(idleModel.whiteVar + idleModel.ar1Var);
  // Sequential, the offset averaged (fit/offsetAveraging.ts): its random σ into every layer's σ, each chip's
  // layers fitted again in order on the moved stack below with the offset one σ higher (fit/offsetSigma.ts in refit);
  // before the pooling and the run's drift, which weigh each layer by its σ as reported.
  if (o.mode === 'sequential' && o.offsetAveraging) {
    for (const [chip, chipStates] of chipLayers) carryOffsetSigmaThroughChip(chipStates, chipStarts.get(chip)!.offsetSigmaRandom ?? 0);
  }
  // The gain drift's share of the index's σ as reported (the pass weighed with the held one; see
  // gainDriftShares), before the pooling: the pool and the run's index drift weigh each layer's
  // own reading by its final σ, so the drift's line is the pooled-index note's and its bars the
  // layers' σ as reported (thickness and n·d swapped below).
  for (const s of states) if (s.gainDriftShares) swapIndexGainDriftShare(s.estimate, s.gainDriftShares);
  // The run's index drift per material is read from each layer's own reading: pooled indices lie
  // on their trend by construction, and the drift's scatter-based σ read 0 from them.
  const ownIndex = new Map(states.map((s) => [s.design.layer, { index: s.estimate.index, indexSigma: s.estimate.indexSigma }]));
  if (o.pooledIndex) {
    // Each material's indices read with its other layers' (fit/pooledIndex.ts). The least-squares
    // fit's residuals are kept to judge whether the law follows the layer's data (a layer resting on
    // a pooled one would otherwise read the pooled index's misfit as its own); those reported are
    // the reported model's, the one drawn over the data.
    const belows = states.map(belowOf);
    // (made only where the reported model's residuals exceed the warning's factor: one model curve a layer less)
    states.forEach((s, j) => {
      const fitted = { ...s };
      s.lawResidualRms = () => layerResidualRms(fitted, belows[j], trace);
    });
    poolIndices(states.map((s) => ({
      material: s.design.material, timeS: s.samples.startTimeS, nominalIndex: s.nominal.re, estimate: s.estimate,
      eligible: s.design.monitor.cut === 'turning-point' && s.qwotAtMonitor >= 0.5 && s.fit.heldIndex === null && !s.estimate.indexGradient,
    })), warnings, o.mode === 'sequential').forEach((e, j) => {
      states[j].estimate = e;
    });
  }
  // The gain drift's share of the thickness's and n·d's σ as reported (the index's taken above).
  for (const s of states) if (s.gainDriftShares) swapGainDriftShare(s.estimate, s.gainDriftShares, false);
  const model = o.modelSeries ? new Float64Array(trace.rowCount).fill(NaN) : undefined;
  const resultBelows = states.map(belowOf);
  // each layer's residuals under its reported model, elsewhere where modelResidualsOf is given:
  // asked for at once, awaited from the last down (a thread taking them from the first meets this one midway)
  const squaredSums: (number | undefined)[] = [];
  // Periodic disturbances through the run, in all the layers' residuals together (fit/runDisturbances.ts):
  // asked for first, so another thread searches the spectrum while this one makes the layers' results.
  const linesAsked = o.runDisturbances ? runLinesRequest(states, resultBelows, trace) : null;
  const lines = linesAsked ? (o.runLinesOf ? o.runLinesOf(linesAsked) : null) : null;
  if (o.modelResidualsOf && !model) {
    const asked = states.map((s, j) => o.modelResidualsOf!(modelResidualsRequest(s, resultBelows[j], trace)));
    for (let j = asked.length - 1; j >= 0; j--) squaredSums[j] = await asked[j];
  }
  const layers = states.map((s, j) => layerResult(s, resultBelows[j], trace, reference ?? noiseFloor.sigma ?? s.calibration.noiseSigma, o, model, squaredSums[j]));
  const found = linesAsked ? (lines ? await lines : runLinesFromRequest(linesAsked)) : [];
  warnings.push(...found.slice(0, 3).map(runDisturbanceWarning));
  const ripple = linesAsked && found.length > 0 ? lampRippleOf(linesAsked, found[0]) : null;
  // Where the held lamp drift's assumed stability makes up most of a layer's σ, a note says so (fit/lampDriftNote.ts).
  const driftHeld = [...chipLayers.keys()].map(heldDrift).find((d) => d.sigmaPerS > 0);
  if (driftHeld && !transient.heldDrifts) {
    const shares = states.flatMap((s, j) => {
      const r = layers[j];
      // (sequential: the share swapped in after the pass, as the reported σ hold it)
      const shift = s.gainDriftShares ? reportedGainDriftShift(s.gainDriftShares, r) : s.lampDriftShift;
      return shift ? [{ layer: s.design.layer, thicknessSigmaNm: r.thicknessSigmaNm, indexSigma: r.indexSigma, indexHeld: r.indexHeld, shift }] : [];
    });
    const note = lampDriftNote(shares, driftHeld.perS * 3600, driftHeld.sigmaPerS * 3600);
    if (note) warnings.push(note);
  }
  // Rates far outside any coating process: the times were likely logged in another unit (fit/timeUnits.ts).
  const units = timeUnitWarning(layers.map((l) => l.rateNmPerS));
  if (units) warnings.unshift(units);
  const summary = runSummary(design, o.mode, seg.inferred, layers, [...calibrations.values()], warnings, o.spectrum, ownIndex);
  const result = model ? { ...summary, model } : summary;
  if (ripple) ripples.set(trace, ripple);
  return result;
}

/**
 * The joint re-estimation of all layers so far on one chip, from all their data, started from
 * the current estimates: one row of the triangular scheme of re-estimating every deposited
 * layer after each new one (A. V. Tikhonravov et al., "Comparison of algorithms for determining
 * the thickness of optical coating layers based on the monochromatic monitoring data",
 * Eurasian J. Math. Comput. Appl. 9(4), 89–99 (2021); the name "triangular algorithm" from
 * memory, after Tikhonravov and Trubetskov's papers on on-line re-engineering).
 */
export function refitChip(
  data: FitLayerData[], chipStates: LayerState[], offsetSignal: number, final: boolean,
  chipGain: SharedGain | null, robust = true, holdDrifts = false,
): JointFitResult {
  // A wandering rate's knots are free in the final joint fit; the refits during the pass hold them
  // (at the current estimate) and add what that costs the end thickness's variance.
  const layers = final ? data : data.map((d, j) => (d.wander && chipStates[j].estimate.wander ? { ...d, wander: { ...d.wander, fixed: chipStates[j].estimate.wander } } : d));
  const input = { fixedBelow: [], layers, start: chipStates.map((s) => s.estimate), offsetSignal, ...(chipGain ? { sharedGain: chipGain } : {}) };
  let joint = fitLayers(input, final ? { robust } : { maxIterations: 4, robust });
  if (final && holdDrifts) {
    // Each rate drift that the data do not carry held at 0, its σ kept (fit/rateDriftChoice.ts).
    const choice = holdUncarriedDrifts(input, joint, { robust });
    choice.held.forEach((j) => (data[j] = choice.layers[j]));
    joint = choice.result;
  }
  if (chipGain && joint.sharedGain) {
    chipGain.gain = joint.sharedGain.gain;
    // A drift the fit held (not fitted: the known drift, applied through each layer's gainDriftPerS)
    // stays as it was: the joint result reports 0 for it, and the pass's next layers take their
    // held gain G·(1 + γ·t) from here.
    if (chipGain.fitDrift) chipGain.driftPerS = joint.sharedGain.driftPerS;
    if (chipGain.driftPrior && joint.sharedGain.priorWeight !== undefined) chipGain.driftPrior.weight = joint.sharedGain.priorWeight;
  }
  chipStates.forEach((s, j) => {
    s.estimate = final ? joint.layers[j] : withWanderVariance(joint.layers[j], s.wanderVarianceNm2 ?? 0);
    if (final) {
      s.iterations = joint.solver.iterations;
      s.converged = joint.solver.converged;
      s.wellDetermined = joint.solver.wellDetermined;
      s.fitPoints = data[j].tauS.length;
    }
  });
  return joint;
}

/**
 * Once the pass is over: each layer whose index was held (a thin layer) held instead at its
 * material's drift estimate from the whole run (its nominal plus the drift the run's fitted
 * layers of the material show, stats/driftEstimateAt), with that estimate's σ. The estimates
 * are the caller's to fit again.
 */
function holdAtRunDrift(states: readonly LayerState[], which: readonly LayerState[]): void {
  const points = states.map(toIndexPoint);
  for (const s of which) {
    if (s.fit.heldIndex === null) continue;
    const drift = driftEstimateAt(points, s.design.material, s.samples.startTimeS);
    if (!drift) continue;
    const held = s.nominal.re + drift.deviation;
    s.heldNote = heldNoteFor(held, s.nominal.re, drift.from, s.qwotAtMonitor, s.optics.wavelengthNm, true, s.heldWhy ?? 'its index does not separate from its thickness');
    s.fit.heldIndex = s.refit.heldIndex = held;
    s.heldIndexSigma = drift.sigma;
    s.estimate = { ...s.estimate, index: held };
  }
}

/**
 * Sequential: the chip's layers below a layer read again with its data (fit/stackPosterior.ts):
 * Gauss–Newton steps of the stack's posterior, the layer fitted again on the moved stack after
 * each; the layers below moved in place (index, and the thickness law scaled as pooledIndex
 * scales it), `below` with them. Returns the layer's fit on the moved stack and the stack's
 * posterior covariance, or null where no step could be taken.
 */
function readStackWithLayer(
  chipStates: readonly LayerState[], below: LayerAt[], fit: FitLayerData, single: JointFitResult, stack: StackCovariance,
  offsetSignal: number, gainPriorWeight: number, again: (below: LayerAt[], start: LayerEstimate) => JointFitResult,
  nuisances: readonly Nuisance[] = [],
): { fit: JointFitResult; stack: StackCovariance } | null {
  const k = chipStates.length;
  const base = below.slice();
  let shift: Float64Array = new Float64Array(2 * k);
  let now = single;
  let cov: Float64Array | null = null;
  for (let it = 0; it < 4; it++) {
    const step = stackPosteriorStep({
      below, layer: fit, params: now.solver.params, offsetSignal, gainPriorWeight, stack, shift, nuisances,
      residualVariance: now.solver.ssr / Math.max(now.solver.dof, 1), noiseCorrelation: now.layers[0].noiseCorrelation,
    });
    if (!step) break;
    shift = step.shift;
    cov = step.cov;
    for (let i = 0; i < k; i++) below[i] = { ...base[i], n: { re: base[i].n.re + shift[2 * i], im: base[i].n.im }, thicknessNm: base[i].thicknessNm + shift[2 * i + 1] };
    now = again(below, now.layers[0]);
    if (step.stepSize < 0.05) break;
  }
  if (!cov) return null;
  chipStates.forEach((s, i) => {
    const e = s.estimate;
    const kf = below[i].thicknessNm / base[i].thicknessNm;
    const index = e.index + shift[2 * i];
    Object.assign(e, {
      index, rateNmPerS: e.rateNmPerS * kf, rateDriftNmPerS2: e.rateDriftNmPerS2 * kf, thicknessNm: e.thicknessNm * kf, opticalThicknessNm: index * e.thicknessNm * kf,
      ...(e.wander ? { wander: e.wander.map((v) => v * kf) } : {}),
    });
    if (s.fit.heldIndex !== null) s.fit.heldIndex = s.refit.heldIndex = index;
  });
  chipStates.forEach((s, i) => {
    if (s.fittedOn) s.fittedOn.below = chipStates.slice(0, i).map((p) => layerAtWavelength(p.fit, p.estimate, s.optics.wavelengthNm));
  });
  return { fit: now, stack: { size: stack.size, cov } };
}

/**
 * Sequential: each layer fitted again, in order, where the stack below it moved after its fit
 * (the growths after the cuts below, revised once the run's shutter time was known).
 */
function fitOnFinalStacks(chipLayers: ReadonlyMap<number, LayerState[]>): void {
  for (const chipStates of chipLayers.values()) {
    chipStates.forEach((s, j) => fitOnFinalStack(s, chipStates.slice(0, j).map((p) => layerAtWavelength(p.fit, p.estimate, s.optics.wavelengthNm))));
  }
}

/** What the windows of fitWithNextLayer (and the held index before them) change in a layer's state, as it stands: a call puts it back. */
function passedState(s: LayerState): () => void {
  const { estimate, heldNote, heldIndexSigma } = s;
  const held = s.fit.heldIndex, refitHeld = s.refit.heldIndex, below = s.fittedOn?.below;
  return () => {
    Object.assign(s, { estimate, heldNote });
    if (heldIndexSigma === undefined) delete s.heldIndexSigma;
    else s.heldIndexSigma = heldIndexSigma;
    s.fit.heldIndex = held;
    s.refit.heldIndex = refitHeld;
    if (s.fittedOn && below) s.fittedOn.below = below;
  };
}

/** One layer of fitOnFinalStacks: its own fit again on `below` where that differs from the stack it was fitted on. */
function fitOnFinalStack(s: LayerState, below: LayerAt[]): void {
  if (!s.fittedOn || below.length === 0) return;
  const was = s.fittedOn.below;
  if (below.length === was.length && below.every((b, k) => b.n.re === was[k].n.re && Math.abs(b.thicknessNm - was[k].thicknessNm) <= 1e-9 * b.thicknessNm)) return;
  // The σ stay those of the pass (the stack's, the growth's and the gain's carried into them).
  s.estimate = withRefitted(s.estimate, s.fittedOn.again(below, s.estimate).layers[0]);
  s.fittedOn.below = below;
}

/**
 * Sequential: a chip's offset σ_o into its layers' σ to first order, as the pass would have gone
 * with the offset σ_o higher: each layer's own fit again, in order, on the layers below as they
 * moved (the offset is the chip's, so every layer moves with it and each carries the ones below),
 * each change added in quadrature (σ² += Δ²). Estimates unchanged.
 */
function carryOffsetSigmaThroughChip(chipStates: readonly LayerState[], offsetSigma: number): void {
  if (!(offsetSigma > 0)) return;
  const moved: LayerEstimate[] = [];
  const changes = chipStates.map((s, j) => {
    const wl = s.optics.wavelengthNm;
    if (!s.offsetAgain) return null;
    // counted from the same fit at the offset as taken (the estimate may hold moves made after the fit)
    const from = s.offsetAgain(chipStates.slice(0, j).map((p) => layerAtWavelength(p.fit, p.estimate, wl)), s.estimate, 0).layers[0];
    const again = s.offsetAgain(moved.map((m, k) => layerAtWavelength(chipStates[k].fit, m, wl)), s.estimate, offsetSigma).layers[0];
    moved.push({ ...s.estimate, index: s.estimate.index + again.index - from.index, rateNmPerS: s.estimate.rateNmPerS + again.rateNmPerS - from.rateNmPerS, rateDriftNmPerS2: s.estimate.rateDriftNmPerS2 + again.rateDriftNmPerS2 - from.rateDriftNmPerS2 });
    return { index: again.index - from.index, thicknessNm: again.thicknessNm - from.thicknessNm, opticalNm: again.opticalThicknessNm - from.opticalThicknessNm };
  });
  if (changes.some((c) => c === null)) return;
  chipStates.forEach((s, j) => {
    const c = changes[j]!, e = s.estimate;
    s.estimate = {
      ...e, indexSigma: Math.hypot(e.indexSigma, c.index), indexOffsetShift: c.index, thicknessSigmaNm: Math.hypot(e.thicknessSigmaNm, c.thicknessNm),
      opticalThicknessSigmaNm: Math.hypot(e.opticalThicknessSigmaNm, c.opticalNm),
    };
  });
}

/** Points per layer in a chip's final joint fit of `layers` layers. */
function finalPointsPerLayer(o: { maxFitPoints: number; refitFinalPoints: number }, layers: number): number {
  return Math.max(100, Math.min(o.maxFitPoints, Math.floor(o.refitFinalPoints / layers)));
}

export function toIndexPoint(s: LayerState): IndexPoint {
  return {
    layer: s.design.layer, material: s.design.material, timeS: s.samples.startTimeS,
    indexDeviation: s.estimate.index - s.nominal.re, indexSigma: s.estimate.indexSigma, indexHeld: s.fit.heldIndex !== null,
  };
}

/**
 * White-noise σ of the detector from every idle stretch (second-difference estimator on the
 * concatenated lit samples; dark samples, below 30 % of the stretch's upper level, left out).
 * σ is null when the idle stretches hold fewer than 50 lit samples.
 */
export function idleNoise(trace: TraceData, idle: readonly { startIndex: number; endIndex: number }[]): { sigma: number | null; samples: number } {
  const lit: number[] = [];
  for (const s of idle) {
    const part = trace.signal.subarray(s.startIndex, s.endIndex);
    if (part.length < 5) continue;
    const sorted = Float64Array.from(part).sort();
    const upper = sorted[Math.floor(0.9 * (sorted.length - 1))];
    for (const v of part) if (v >= 0.3 * upper) lit.push(v);
  }
  return { sigma: lit.length >= 50 ? noiseSigma(lit) : null, samples: lit.length };
}

/** A layer's placed boundaries' spread without a layer column (fit/levelCutEnds.ts), s: its end's where it is a level cut, its start's; 0 where none. */
function placedSpreadS(placed: readonly Segment[], s: LayerState): { endS: number; startS: number } {
  const p = placed.find((x) => x.layer === s.design.layer);
  return { endS: p && s.design.monitor.cut === 'level' ? p.endSigmaS ?? 0 : 0, startS: p?.startSigmaS ?? 0 };
}
