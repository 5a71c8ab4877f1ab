import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { fromNK, growingLayerSignal, type Complex } from '../optics';
import { driftEstimateAt, type IndexPoint } from '../stats';
import { segmentTrace, type TraceData } from '../trace';
import { calibrateChip, type ChipCalibration } from './calibrateChip';
import { fitLayers, type LayerEstimate } from './fitLayers';
import { gatherLayerSamples, type LayerSamples } from './layerSamples';
import { layerAtWavelength, type FitLayerData, type MonitorOptics } from './layerModel';
import { layerResult } from './layerResult';
import { runSummary } from './runSummary';
import { startValues } from './startValues';
import { subsampleUniform } from './subsample';
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
  calibration: ChipCalibration;
}

export const ANALYZE_DEFAULTS = {
  mode: 'sequential',
  maxFitPoints: 2000,
  refitPointsPerLayer: 400,
  refitFinalPoints: 16000,
  gain: 'per-layer',
  thinLayerQwot: 0.5,
  heldIndex: 'run-drift',
  residualWarnFactor: 2,
  cutErrorWarnPct: 2,
  spectrum: { fromNm: 400, toNm: 800, stepNm: 2 },
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
 * Pure: no I/O.
 */
export async function analyzeRun(design: Design, trace: TraceData, options: AnalyzeOptions = {}): Promise<AnalysisResult> {
  const o = { ...ANALYZE_DEFAULTS, ...options };
  const warnings: string[] = trace.warnings.map((w) => w.message);
  const seg = segmentTrace(trace, { chipOfLayer: (l) => design.layers[l - 1]?.monitor.chip ?? 1 });
  for (const w of seg.warnings) warnings.push(w.code === 'segments_inferred' && !w.message ? 'the trace has no layer column: layer segments were found from the signal' : w.message);
  const samplesByLayer = gatherLayerSamples(trace, seg.layers);
  for (const l of samplesByLayer.keys()) {
    if (l > design.layers.length) warnings.push(`the trace has layer ${l}, the design only ${design.layers.length}; ignored`);
  }
  const order = design.layers.filter((l) => samplesByLayer.has(l.layer)).sort((a, b) => samplesByLayer.get(a.layer)!.startTimeS - samplesByLayer.get(b.layer)!.startTimeS);
  const missing = design.layers.filter((l) => !samplesByLayer.has(l.layer)).map((l) => l.layer);
  if (missing.length) warnings.push(`no samples for design layer${missing.length > 1 ? 's' : ''} ${missing.join(', ')}`);

  const chipLayers = new Map<number, LayerState[]>();
  const calibrations = new Map<number, ChipCalibration>();
  const states: LayerState[] = [];
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
    let calibration = calibrations.get(chip);
    if (!calibration) {
      const first = samples.indices[0];
      const idle = seg.idle.filter((s) => s.endIndex <= first && s.endIndex >= first - 1).pop();
      const modelledBare = growingLayerSignal({ ...optics, below, growing: fromNK(1), pol: 's' }, [0])[0];
      const firstCount = Math.min(samples.indices.length, 20);
      calibration = calibrateChip({
        chip, modelledBare, knownOffset: [...calibrations.values()].pop()?.offset,
        idleSignal: idle ? trace.signal.subarray(idle.startIndex, idle.endIndex) : [],
        firstLayerSignal: pick(trace.signal, Int32Array.from({ length: firstCount }, (_, i) => i), samples.indices),
      });
      if (calibration.source === 'first-layer') warnings.push(`chip ${chip}: no bare-chip stretch before layer ${dl.layer}; gain taken from the layer's first samples`);
      calibrations.set(chip, calibration);
    }

    const memo = new Map<number, Complex>();
    const model = design.materials[dl.material];
    const nominalAt = (w: number) => {
      let v = memo.get(w);
      if (!v) memo.set(w, (v = indexAt(model, w)));
      return v;
    };
    const nominal = nominalAt(wl);
    const qwotAtMonitor = (4 * nominal.re * dl.thicknessNm) / wl;
    const held = qwotAtMonitor < o.thinLayerQwot;
    let heldIndex: number | null = null, heldNote: string | null = null;
    if (held) {
      const points: IndexPoint[] = states.map(toIndexPoint);
      const drift = o.heldIndex === 'run-drift' ? driftEstimateAt(points, dl.material, samples.startTimeS) : null;
      heldIndex = nominal.re + (drift?.deviation ?? 0);
      heldNote = `index held at ${heldIndex.toFixed(4)} (${drift ? `nominal ${nominal.re.toFixed(4)} + this run's drift estimate from ${drift.from} layer${drift.from > 1 ? 's' : ''}` : 'the material\'s nominal'}): the layer is ${qwotAtMonitor.toFixed(2)} QWOT at ${wl} nm, too thin to separate index from thickness; thickness only`;
    }
    const n = samples.tauS.length;
    const durationS = samples.tauS[n - 1];
    const make = (maxPoints: number): FitLayerData => {
      const sub = subsampleUniform(samples.tauS, 0, n, maxPoints);
      return {
        optics, nominalAt, tauS: pick(samples.tauS, sub), y: pick(trace.signal, sub, samples.indices), durationS,
        extinction: -nominal.im, heldIndex, fitDrift: !held,
        heldGain: o.gain === 'chip' && calibration.source === 'bare-chip' ? calibration.gain : null,
      };
    };
    const fit = make(o.maxFitPoints);
    const refit = make(o.refitPointsPerLayer);
    const grid = make(300);
    const sv = startValues({
      gain: fit.heldGain ?? undefined, optics, below, extinction: -nominal.im, tauS: grid.tauS, y: grid.y, offsetSignal: calibration.offset,
      index: heldIndex ?? nominal.re, searchIndex: !held, rateGuessNmPerS: dl.thicknessNm / Math.max(durationS, 1e-9),
    });
    const single = fitLayers({
      fixedBelow: below, layers: [fit], offsetSignal: calibration.offset,
      start: [{ index: sv.index, rateNmPerS: sv.rateNmPerS, rateDriftNmPerS2: 0, gain: fit.heldGain ?? sv.gain }],
    });
    const state: LayerState = {
      design: dl, samples, optics, nominal, fit, refit, make, estimate: single.layers[0], iterations: single.solver.iterations, fitPoints: fit.tauS.length,
      converged: single.solver.converged, wellDetermined: single.solver.wellDetermined, heldNote, calibration,
    };
    prior.push(state);
    chipLayers.set(chip, prior);
    states.push(state);
    if (o.mode === 'refit' && prior.length > 1) refitChip(prior.map((p) => p.refit), prior, calibration.offset, false);
    done++;
    o.onProgress?.(done, order.length);
    if (done % 4 === 0) await Promise.resolve();
  }

  if (o.mode === 'refit') {
    for (const chipStates of chipLayers.values()) {
      if (chipStates.length < 2) continue;
      const perLayer = Math.max(100, Math.min(o.maxFitPoints, Math.floor(o.refitFinalPoints / chipStates.length)));
      refitChip(chipStates.map((p) => p.make(perLayer)), chipStates, chipStates[0].calibration.offset, true);
    }
  }

  const layers = states.map((s) => {
    const chipStates = chipLayers.get(s.samples.chip)!;
    const below = chipStates.slice(0, chipStates.indexOf(s)).map((p) => layerAtWavelength(p.fit, p.estimate, s.optics.wavelengthNm));
    return layerResult(s, below, trace, o);
  });
  return runSummary(design, o.mode, seg.inferred, layers, [...calibrations.values()], warnings, o.spectrum);
}

/**
 * The joint re-estimation of all layers so far on one chip, from all their data, started from
 * the current estimates: one row of the triangular scheme of re-estimating every deposited
 * layer after each new one (A. V. Tikhonravov et al., "Comparison of algorithms for determining
 * the thickness of optical coating layers based on the monochromatic monitoring data",
 * Eurasian J. Math. Comput. Appl. 9(4), 89–99 (2021); the name "triangular algorithm" from
 * memory, after Tikhonravov and Trubetskov's papers on on-line re-engineering).
 */
export function refitChip(data: FitLayerData[], chipStates: LayerState[], offsetSignal: number, final: boolean): void {
  const joint = fitLayers(
    { fixedBelow: [], layers: data, start: chipStates.map((s) => s.estimate), offsetSignal },
    final ? {} : { iterationsPerRound: 4, maxRounds: 2 },
  );
  chipStates.forEach((s, j) => {
    s.estimate = joint.layers[j];
    if (final) {
      s.iterations = joint.solver.iterations;
      s.converged = joint.solver.converged;
      s.wellDetermined = joint.solver.wellDetermined;
      s.fitPoints = data[j].tauS.length;
    }
  });
}

export function toIndexPoint(s: LayerState): IndexPoint {
  return {
    layer: s.design.layer, material: s.design.material, timeS: s.samples.startTimeS,
    indexDeviation: s.estimate.index - s.nominal.re, indexSigma: s.estimate.indexSigma, indexHeld: s.fit.heldIndex !== null,
  };
}
