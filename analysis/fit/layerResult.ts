import { fromNK, gradedGrowingSignal, growingLayerSignal, type LayerAt } from '../optics';
import { type TraceData } from '../trace';
import { type LayerState } from './analyzeRun';
import { modelTurningPoints, timeToThickness } from './cutTiming';
import { cutWarning } from './cutWarning';
import { INDEX_BOUND } from './fitLayers';
import { thicknessAt, type MonitorOptics } from './layerModel';
import { lawThicknessSeries, lawTimeToThickness, wanderKnotRates, type RateWander, type ThicknessLaw } from './rateWander';
import { sampleReadings } from './sampleReadings';
import { observedTurningPoints } from './observedTurningPoints';
import { realTime } from './startTransient';
import { type LayerResult, type TurningPointAt } from './types';

/** A fitted wander beyond this fraction of the rate draws a warning (a source's own wander is a few %). */
const RATE_DEPARTURE_WARN = 0.1;

/** The largest |w|/(r + a·τ) at the wander's knots (the wander is linear between them). */
function maxWanderFraction(w: RateWander, e: { rateNmPerS: number; rateDriftNmPerS2: number; wander?: Float64Array }): number {
  const c = wanderKnotRates(w, e.wander!);
  let m = 0;
  c.forEach((v, k) => (m = Math.max(m, Math.abs(v) / Math.max(Math.abs(e.rateNmPerS + e.rateDriftNmPerS2 * w.knotsS[k]), 1e-12))));
  return m;
}

/** A fitted thickness beyond this many times the design's is not taken as a film (layerResult). */
const FAR_BEYOND_DESIGN = 10;

interface ResultOptions {
  residualWarnFactor: number;
  cutErrorWarnPct: number;
}

/**
 * The reported figures of one fitted layer: residuals on all samples, cut timing, warnings.
 * With modelOut (one slot per trace sample), the modelled reading offset + gain·M(d(τ)) is
 * written at each of the layer's samples, for plotting the fit over the trace.
 */
export function layerResult(
  s: LayerState, below: readonly LayerAt[], trace: TraceData, noiseSigma: number, o: ResultOptions, modelOut?: Float64Array,
  /** Σ of the squared residuals as modelSquaredResiduals gives them for this layer (e.g. made on another thread); computed here when absent or with modelOut. */
  squaredSum?: number,
): LayerResult {
  const { design: dl, samples, optics, nominal, estimate: e, calibration } = s;
  const wl = optics.wavelengthNm;
  const k = -nominal.im;
  const n = samples.tauS.length;
  const wander = e.wander ? s.fit.wander : undefined;
  // The residuals reported are those of the model reported (the one drawn over the data); where
  // they exceed the warning's factor after the index pooling moved the estimates
  // (fit/pooledIndex.ts: a pooled index, or one below, fits a little worse by design, and that is
  // no departure from a smooth rate), the least-squares fit's own must too.
  const ss = squaredSum !== undefined && !modelOut ? squaredSum
    : squaredResiduals(trace.signal, samples.indices, calibration.offset, e.gain, modelSignal(s, below), modelOut);
  const residualRms = Math.sqrt(ss / n);
  const noise = noiseSigma / e.gain;
  const residualToNoise = noise > 0 ? residualRms / noise : NaN;
  const lawMisfit = residualToNoise > o.residualWarnFactor && s.lawResidualRms ? s.lawResidualRms() / noise : residualToNoise;

  const quarter = wl / 4;
  const cutErrorQwotPct = ((e.opticalThicknessNm - nominal.re * dl.thicknessNm) / quarter) * 100;
  const cutErrorSigmaQwotPct = (e.opticalThicknessSigmaNm / quarter) * 100;
  const targetNm = (nominal.re * dl.thicknessNm) / e.index;
  // A thickness far beyond the design's is no film the model describes (a chip column left at
  // the old chip put a layer on the wrong stack: 5.8·10¹¹ nm, whose turning points no grid holds).
  const farBeyond = !(e.thicknessNm <= FAR_BEYOND_DESIGN * Math.max(targetNm, dl.thicknessNm));
  const tps = farBeyond ? [] : modelTurningPoints(optics, below, e.index, k, 1.3 * Math.max(e.thicknessNm, targetNm));
  const toTime = (thicknessNm: number) => {
    const tau = wander ? lawTimeToThickness(e, wander, thicknessNm, s.fit.durationS) : timeToThickness(thicknessNm, e.rateNmPerS, e.rateDriftNmPerS2);
    // the fit's τ is the exposure time under a start transient (fit/startTransient.ts)
    return Number.isFinite(tau) ? samples.startTimeS + realTime(tau, samples.startDelayS ?? 0) : null;
  };
  let idealCutTimeS: number | null = null;
  const warnings: string[] = [];
  if (dl.monitor.cut === 'level') {
    idealCutTimeS = toTime(targetNm);
  } else {
    // The turning point that completes the layer: the modelled extremum nearest its target.
    let best: number | null = null;
    for (const tp of tps) if (best === null || Math.abs(tp.thicknessNm - targetNm) < Math.abs(best - targetNm)) best = tp.thicknessNm;
    if (best !== null && Math.abs(best - targetNm) < 0.35 * (quarter / e.index)) idealCutTimeS = toTime(best);
    else warnings.push('no modelled turning point near the target thickness: the ideal cut time is unknown');
  }
  const passed = tps.filter((tp) => tp.thicknessNm <= e.thicknessNm);
  const lastTp = passed[passed.length - 1];
  let lastTurningPoint: TurningPointAt | null = null;
  if (lastTp) {
    const timeS = toTime(lastTp.thicknessNm);
    if (timeS !== null) lastTurningPoint = { timeS, signal: lastTp.signal, kind: lastTp.kind, thicknessNm: lastTp.thicknessNm };
  }
  // The turning points the data show, for comparison with the model's (from the second thread when it ran there).
  const observed = s.observed ?? observedTurningPoints(samples.tauS, trace.timeS, trace.signal, samples.indices);
  const seen = observed.points;
  // An unconfirmed end extremum counts only if reached (not projected past the last sample) and
  // placed near its own sample.
  const step = observed.stepS;
  const reached = seen.filter((t, j) => t.confirmed || (t.timeS <= samples.endTimeS + step && Math.abs(t.timeS - observed.sampleTimeS[j]) < 0.05 * (samples.endTimeS - samples.startTimeS)));
  const lastSeen = reached[reached.length - 1];
  const observedTurningPoint = lastSeen
    ? { timeS: lastSeen.timeS, signal: (lastSeen.value - calibration.offset) / e.gain, kind: lastSeen.kind, confirmed: lastSeen.confirmed }
    : null;
  const lastIndex = samples.indices[n - 1];
  const crystalNm = trace.crystalNm ? trace.crystalNm[lastIndex] : null;
  const opticalToCrystalRatio = crystalNm !== null && crystalNm > 0 ? e.thicknessNm / crystalNm : null;

  if (s.heldNote) warnings.push(s.heldNote);
  if (Math.abs(e.index / nominal.re - 1) > INDEX_BOUND - 1e-4) {
    warnings.push(`the index ran to the fit's bound (±${INDEX_BOUND * 100} % of nominal): the fit cannot be trusted (wrong design, stack below, or segmentation?)`);
  }
  if (farBeyond) {
    warnings.push(`the fitted thickness (${e.thicknessNm.toPrecision(3)} nm) is more than ${FAR_BEYOND_DESIGN}× the design's: the model does not describe this layer (wrong design, chip column, stack below, or segmentation?)`);
  }
  if (!(e.thicknessNm > 0)) {
    warnings.push('the fitted thickness is not physical (≤ 0 nm): the model does not describe this layer (wrong design, stack below, or segmentation?)');
  }
  if (samples.runs > 1) warnings.push(`the layer was deposited in ${samples.runs} runs; the pauses are left out of its time base`);
  if (!s.converged) warnings.push('the fit did not converge within its iteration limit');
  if (!s.wellDetermined) warnings.push('the data do not determine every parameter (singular normal matrix): uncertainties unknown');
  if (lawMisfit > o.residualWarnFactor) {
    warnings.push(`residuals ${lawMisfit.toFixed(1)}× the noise: the signal departs from a smooth rate (a rate spike or jump?) or from the model`);
  }
  // A wandering rate follows a spike or jump, so the residuals no longer show it: say so from the wander.
  const departure = wander && e.wander ? maxWanderFraction(wander, e) : 0;
  if (departure > RATE_DEPARTURE_WARN) {
    warnings.push(`the rate departs from its smooth trend by up to ${(departure * 100).toFixed(0)} % within the layer (a rate spike or jump?)`);
  }
  const disturbances = s.spectrum.disturbances.map((x) => ({ frequencyHz: x.frequencyHz, amplitude: x.amplitude / e.gain, note: x.note }));
  for (const x of disturbances) {
    warnings.push(`periodic disturbance at ${x.frequencyHz.toFixed(3)} Hz (amplitude ${(x.amplitude * 100).toFixed(2)} % of full scale): ${x.note}`);
  }
  const cut = cutWarning(cutErrorQwotPct, cutErrorSigmaQwotPct, o.cutErrorWarnPct, wl);
  if (cut) warnings.push(cut);
  return {
    layer: dl.layer, material: dl.material, chip: samples.chip, wavelengthNm: wl, mode: dl.monitor.mode, cut: dl.monitor.cut,
    designThicknessNm: dl.thicknessNm, qwot: dl.qwot, qwotDeposited: e.opticalThicknessNm / quarter,
    thicknessNm: e.thicknessNm, thicknessSigmaNm: e.thicknessSigmaNm,
    index: e.index, indexSigma: e.indexSigma, nominalIndex: nominal.re, indexDeviation: e.index - nominal.re,
    indexHeld: s.fit.heldIndex !== null,
    ...gradientFigures(s),
    rateNmPerS: e.rateNmPerS, rateSigmaNmPerS: e.rateSigma, rateDriftNmPerS2: e.rateDriftNmPerS2, rateDriftSigmaNmPerS2: e.rateDriftSigma,
    gain: e.gain, cutErrorQwotPct, cutErrorSigmaQwotPct, residualRms, residualToNoise,
    startTimeS: samples.startTimeS, cutTimeS: samples.endTimeS, idealCutTimeS, lastTurningPoint,
    observedTurningPoints: seen.filter((t) => t.confirmed).length, lastObservedTurningPoint: observedTurningPoint, crystalNm, opticalToCrystalRatio,
    fringeFrequencyHz: s.spectrum.fringeFrequencyHz, fringeRateNmPerS: s.spectrum.fringeRateNmPerS, disturbances,
    sampleCount: n, fitPoints: s.fitPoints, iterations: s.iterations, converged: s.converged, warnings,
  };
}

/** The layer's modelled response M(d(τ)) at each of its samples, on `below`. */
function modelSignal(s: LayerState, below: readonly LayerAt[]): Float64Array {
  return modelAt(modelOf(s, below), s.samples.tauS);
}

/** What the layer's modelled response reads: its optics, the stack below, the growing layer's index and thickness law. */
interface LayerModelOf {
  optics: MonitorOptics;
  below: readonly LayerAt[];
  index: number;
  extinction: number;
  indexGradient: number;
  thicknessNm: number;
  law: ThicknessLaw;
  /** The wander's knots, where the law has a wander. */
  wander?: RateWander;
}

function modelOf(s: LayerState, below: readonly LayerAt[]): LayerModelOf {
  const { optics, nominal, estimate: e } = s;
  const wander = e.wander ? s.fit.wander : undefined;
  return {
    optics, below, index: e.index, extinction: -nominal.im, indexGradient: e.indexGradient ?? 0, thicknessNm: e.thicknessNm,
    law: { rateNmPerS: e.rateNmPerS, rateDriftNmPerS2: e.rateDriftNmPerS2, ...(e.wander ? { wander: e.wander } : {}) },
    ...(wander ? { wander } : {}),
  };
}

function modelAt(m: LayerModelOf, tauS: Float64Array): Float64Array {
  const n = tauS.length;
  const d = m.wander ? lawThicknessSeries(m.law, m.wander, tauS, new Float64Array(n)) : thicknesses(tauS, m.law.rateNmPerS, m.law.rateDriftNmPerS2);
  const dn = m.indexGradient;
  return dn !== 0
    ? gradedGrowingSignal({ ...m.optics, below: m.below, growing: fromNK(m.index - dn / 2, m.extinction), pol: 's' }, dn / Math.max(m.thicknessNm, 1e-9), d)
    : growingLayerSignal({ ...m.optics, below: m.below, growing: fromNK(m.index, m.extinction), pol: 's' }, d);
}

/**
 * A layer's reported model and samples as plain data (structured-cloneable; τ and the readings
 * views of shared memory where they lie there), for modelSquaredResiduals on another thread.
 */
export interface ModelResidualsRequest {
  model: LayerModelOf;
  tauS: Float64Array;
  /** The layer's readings, sample by sample. */
  y: Float64Array;
  offset: number;
  gain: number;
}

/** layerResult's residual sum for s on `below`, as a request (see ModelResidualsRequest). */
export function modelResidualsRequest(s: LayerState, below: readonly LayerAt[], trace: TraceData): ModelResidualsRequest {
  return { model: modelOf(s, below), tauS: s.samples.tauS, y: sampleReadings(trace.signal, s.samples.indices), offset: s.calibration.offset, gain: s.estimate.gain };
}

/** Σ of the layer's squared residuals in model units, (reading − offset)/gain − M, as layerResult sums them. */
export function modelSquaredResiduals(r: ModelResidualsRequest): number {
  return squaredResidualsOf(r.y, r.offset, r.gain, modelAt(r.model, r.tauS));
}

/** RMS of the layer's residuals (reading − offset)/gain − M on all its samples, in model units. */
export function layerResidualRms(s: LayerState, below: readonly LayerAt[], trace: TraceData): number {
  return Math.sqrt(squaredResiduals(trace.signal, s.samples.indices, s.calibration.offset, s.estimate.gain, modelSignal(s, below)) / s.samples.tauS.length);
}

/**
 * The layer's residuals under its reported model, (reading − offset)/gain − M in model units
 * (fractions of full scale), at every `step`-th of its samples, with the samples' trace times and M.
 */
export function layerResidualsEvery(s: LayerState, below: readonly LayerAt[], trace: TraceData, step: number): { timeS: Float64Array; residual: Float64Array; model: Float64Array } {
  const count = Math.ceil(s.samples.tauS.length / step);
  const tauS = new Float64Array(count), timeS = new Float64Array(count), residual = new Float64Array(count);
  for (let j = 0; j < count; j++) {
    const i = j * step;
    tauS[j] = s.samples.tauS[i];
    timeS[j] = trace.timeS[s.samples.indices[i]];
  }
  const m = modelAt(modelOf(s, below), tauS);
  const { offset } = s.calibration, { gain } = s.estimate;
  for (let j = 0; j < count; j++) residual[j] = (trace.signal[s.samples.indices[j * step]] - offset) / gain - m[j];
  return { timeS, residual, model: m };
}

/** The index gradient's figures: the fitted ones on a graded layer, the trial's on one kept uniform. */
function gradientFigures(s: LayerState): Pick<LayerResult, 'indexGradient' | 'indexGradientSigma' | 'indexGradientKept'> {
  const t = s.gradientTrial;
  if (!t) return {};
  if (!t.kept) return { indexGradient: t.deltaN, indexGradientSigma: t.sigma, indexGradientKept: false };
  return { indexGradient: s.estimate.indexGradient ?? t.deltaN, indexGradientSigma: s.estimate.indexGradientSigma ?? t.sigma, indexGradientKept: true };
}

// The per-sample loops sit in small functions of their own, so the engine optimises them apart
// from layerResult (whose states differ in shape from layer to layer).

function thicknesses(tauS: Float64Array, rateNmPerS: number, rateDriftNmPerS2: number): Float64Array {
  const d = new Float64Array(tauS.length);
  for (let i = 0; i < tauS.length; i++) d[i] = thicknessAt(tauS[i], rateNmPerS, rateDriftNmPerS2);
  return d;
}

/** Σ of the squared residuals in model units, (y − offset)/gain − M, y the layer's readings in order. */
function squaredResidualsOf(y: Float64Array, offset: number, gain: number, m: Float64Array): number {
  let ss = 0;
  for (let i = 0; i < m.length; i++) {
    const r = (y[i] - offset) / gain - m[i];
    ss += r * r;
  }
  return ss;
}

/** Σ of the squared residuals in model units, (reading − offset)/gain − M; the modelled readings into modelOut when given. */
function squaredResiduals(signal: Float64Array, indices: Int32Array, offset: number, gain: number, m: Float64Array, modelOut?: Float64Array): number {
  if (modelOut) for (let i = 0; i < m.length; i++) modelOut[indices[i]] = offset + gain * m[i];
  return squaredResidualsOf(sampleReadings(signal, indices), offset, gain, m);
}

