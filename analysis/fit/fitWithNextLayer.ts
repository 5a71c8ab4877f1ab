import { type LayerAt } from '../optics';
import { type LayerState } from './analyzeRun';
import { fitLayers, type JointFitInput, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { type DriftPrior } from './gainDriftPrior';
import { layerAtWavelength, type FitLayerData } from './layerModel';
import { holdUncarriedDrifts } from './rateDriftChoice';
import { gridParabola, START_DELAY_GRID_S } from './startDelay';
import { exposureTime, exposureTimes } from './startTransient';

/** What a sequential layer brings to a joint fit with the next ones: its gain start (held, anchored or its own) and the pass's gain prior. */
export interface PairPart {
  startGain: (e: LayerEstimate) => number;
  gainPrior?: { fraction: number; noiseSigma: number };
  /**
   * The chip's calibrated gain (its σ from the bare chip) and the lamp drift's prior: where a
   * window reads the rate's start-up, its layers that hold the chip's gain take G·(1 + γ·t) with
   * G under that σ and γ under the prior (see fitWindow).
   */
  lampDrift?: { chipGain: number; chipGainSigma: number; prior: DriftPrior; noiseSigma: number };
}

/** A layer's estimate with a later fit's values in place of its own; its σ (and all else) kept, those of the pass. */
export function withRefitted(e: LayerEstimate, fitted: JointFitResult['layers'][number]): LayerEstimate {
  const { index, rateNmPerS, rateDriftNmPerS2, gain, wander, indexGradient, thicknessNm, opticalThicknessNm } = fitted;
  return { ...e, index, rateNmPerS, rateDriftNmPerS2, gain, thicknessNm, opticalThicknessNm, ...(wander ? { wander } : {}), ...(indexGradient !== undefined ? { indexGradient } : {}) };
}

/** Layers in each joint fit: the level-cut layer and the two above it on its chip. */
export const NEXT_LAYER_WINDOW = 3;

/** A layer no window fits again (a turning-point cut), on the stack below as it now stands: its own fit again where that moved (option fitOnFinalStack), else left. */
export type OwnFitAgain = (s: LayerState, below: LayerAt[]) => void;

/**
 * Sequential mode, once the pass is over (option fitWithNextLayer): each layer cut on level
 * fitted again jointly with the next two on its chip (NEXT_LAYER_WINDOW; fewer at the chip's end),
 * bottom up, on the stack below as it then stands; the level cuts of the window keep the joint
 * fit's estimates and the next window starts from them, so each ends with the window it starts.
 * Held thin layers cut on level take their index from the whole run first (the caller's). A level
 * cut's own samples tell its index and thickness along one curve only (its end level gives the
 * stack's transmittance, not the admittance the next layer grows on, and just past a turning
 * point the level tells the thickness little); the next layers, which grow on that admittance,
 * pin the rest. The joint fit holds each rate drift its layer's data do not carry
 * (fit/rateDriftChoice.ts, as refit's final joint fit). Turning-point cuts keep their own fits
 * (their ends are read from the next layer's start already, fit/growthFromNext.ts), each taken to
 * `ownFitAgain` on the stack as it now stands: a reflectance run's one level cut among turning
 * points (chamber simulator, R with an offset, seeds 51–62) went 1.02 → 1.26 % with the window's
 * turning-point layers kept, 0.98 % with their own fits.
 *
 * The window reads the start of its upper layers as made by the stack below; where the rate
 * starts up as the shutter opens (fit/startTransient.ts, not modelled on level cuts in this pass),
 * the window took that start-up into the layers below. So where a window shows it (its χ² falls
 * past START_UP_GAIN_CHI2 with the upper layers on a start delay's clock, startUpGainChi2), the
 * window is fitted on the clock of the best delay δ, and the chip's later windows on the same δ
 * (the source and shutter are the chip's): startUpFit. There the lamp's drift within the chip is
 * fitted under its prior too, where the window's layers hold the chip's gain: δ held at 0 drift
 * reads a drifting lamp as a start-up (real-chamber BBAR, lamp −1 %/h, ramp 1.5 s: δ̂ 2.5–3 s). Before,
 * a chip whose windows showed the start-up was put back as the pass left it: the pass holds a thin
 * first layer's index at its nominal, and where the run's index is off the nominal the chip's
 * layers stayed off with it (the demo's four-layer AR, Ta₂O₅ 0.015 below nominal, lamp −0.5 %/h,
 * ramp 1.2 s, seeds 587–602: layers 1–4 RMS 2.90/3.22/0.83/1.09 → 1.09/1.68/0.46/1.00 %, layer 3's
 * "residuals 1.9–2.6× the noise" on 3 of 16 runs → none; real-chamber BBAR, seeds 21–36, max 2.48 →
 * 2.08 %, RMS 1.07 → 0.73 %). σ stay those of the pass (the stack's, the growth's, the gain's, the
 * held lamp drift's and the held index's carried into them, wider than the window's own). Returns
 * each chip's δ where one was read.
 */
export function fitWithNextLayers(chipLayers: ReadonlyMap<number, LayerState[]>, robust: boolean, ownFitAgain: OwnFitAgain): Map<number, number> {
  const startUps = new Map<number, number>();
  for (const chipStates of chipLayers.values()) {
    for (let j = 0; j < chipStates.length; j++) {
      const s = chipStates[j];
      if (!opensWindow(chipStates, j)) {
        ownFitAgain(s, chipStates.slice(0, j).map((p) => layerAtWavelength(p.fit, p.estimate, s.optics.wavelengthNm)));
        continue;
      }
      const result = fitWindow(chipStates, j, robust, startUps);
      // the level cuts keep the window's estimates (the next window starts from them); the turning-point cuts their own fits
      chipStates.slice(j, j + NEXT_LAYER_WINDOW).forEach((p, k) => {
        if (p.design.monitor.cut !== 'level') return;
        p.estimate = withRefitted(p.estimate, result.layers[k]);
      });
    }
  }
  return startUps;
}

/**
 * Once the windows are done, each of `held` (thin level cuts whose index the caller has just held
 * again, from the run's layers as the windows left them) fitted again in its own window on the
 * stack below as it now stands, the layer alone taking the window's estimate: the layers above
 * keep theirs, so nothing else moves. The index held before the windows came from the pass's
 * readings of the material's thicker level cuts, which a thin stack below puts several times
 * further off than the windows do (thin level cuts in R, sequential, seeds 71–86: the chip's
 * first layer, 0.3 QWOT H, held from layers 3 and 5 up to 0.025 off, n·d −2.9 %; held again
 * 0.011, −0.8 %). A chip's start-up as fitWithNextLayers read it (`startUps`) is read so
 * again. Returns the layers fitted again (not one whose window lacks a layer the pass gave a pair
 * part).
 */
export function fitHeldAgain(chipLayers: ReadonlyMap<number, LayerState[]>, robust: boolean, held: ReadonlySet<LayerState>, startUps: Map<number, number>): Set<LayerState> {
  const done = new Set<LayerState>();
  for (const chipStates of chipLayers.values()) {
    chipStates.forEach((s, j) => {
      if (!held.has(s) || !opensWindow(chipStates, j)) return;
      const result = fitWindow(chipStates, j, robust, startUps);
      s.estimate = withRefitted(s.estimate, result.layers[0]);
      done.add(s);
    });
  }
  return done;
}

/** Whether chip layer j opens a window: a level cut whose window's layers all have the pass's pair part. */
function opensWindow(chipStates: readonly LayerState[], j: number): boolean {
  return chipStates[j].design.monitor.cut === 'level' && chipStates.slice(j, j + NEXT_LAYER_WINDOW).every((p) => p.pairPart);
}

/**
 * The joint fit of the window that chip layer j starts (j and the next ones, NEXT_LAYER_WINDOW),
 * on the stack below as it stands, the rate drifts its layers' data do not carry held at 0. Where
 * the chip's start-up was read (`startUps`, its δ), or this window shows it, on that δ's clock
 * (startUpFit).
 */
function fitWindow(chipStates: readonly LayerState[], j: number, robust: boolean, startUps: Map<number, number>): JointFitResult {
  const s = chipStates[j];
  const wl = s.optics.wavelengthNm;
  const below = chipStates.slice(0, j).map((p) => layerAtWavelength(p.fit, p.estimate, wl));
  const window = chipStates.slice(j, j + NEXT_LAYER_WINDOW);
  // A wandering rate's knots held at their estimate (as refitChip's fits during the pass).
  const layers = window.map((p) => (p.fit.wander && p.estimate.wander ? { ...p.fit, wander: { ...p.fit.wander, fixed: p.estimate.wander } } : p.fit));
  const { gainPrior } = s.pairPart!;
  const start = window.map((p) => ({ ...p.estimate, gain: p.pairPart!.startGain(p.estimate) }));
  const input: JointFitInput = {
    fixedBelow: below, layers, offsetSignal: s.calibration.offset, start,
    ...(sharesGain(layers, gainPrior) ? { sharedGain: windowGain(layers[0], start[0].gain, gainPrior!) } : gainPrior ? { gainPrior } : {}),
  };
  if (window.length < 2) return fitHoldingDrifts(input, robust);
  const chip = s.samples.chip;
  const known = startUps.get(chip);
  if (known !== undefined) return onDelayClock(withLampDrift(input, s.pairPart!.lampDrift), known, robust);
  const result = fitHoldingDrifts(input, robust);
  const held = startUpGain(input, result, robust);
  if (!(held.gain > START_UP_GAIN_CHI2)) return result;
  const drifting = withLampDrift(input, s.pairPart!.lampDrift);
  const found = drifting === input ? held : startUpFit({ ...drifting, start: result.layers }, robust);
  startUps.set(chip, found.delayS);
  return found.result;
}

/** A window's joint fit, the rate drifts its layers' data do not carry held at 0 (fit/rateDriftChoice.ts). */
function fitHoldingDrifts(input: JointFitInput, robust: boolean): JointFitResult {
  return holdUncarriedDrifts(input, fitLayers(input, { robust }), { robust }).result;
}

/** A window's fit with its upper layers (all but the first) on the exposure clock of a start delay δ (fit/startTransient.ts). */
function onDelayClock(input: JointFitInput, delayS: number, robust: boolean): JointFitResult {
  const layers = input.layers.map((d, k) => (k === 0 ? d : { ...d, tauS: exposureTimes(d.tauS, delayS), durationS: exposureTime(d.durationS, delayS) }));
  return fitHoldingDrifts({ ...input, layers }, robust);
}

/**
 * The δ whose fit has the least χ², and that fit: the best on START_DELAY_GRID_S past 0, then the
 * vertex of the parabola through it and its two neighbours where that fits lower (the grid's
 * 0.5 s steps are coarse against a 1–1.5 s start-up: real-chamber BBAR, seeds 21–36, max 2.18 →
 * 2.08 %, seeds 101–112 2.97 → 2.87 %, the harness's seeds 0.52 → 0.29 %; the demo-like run
 * (windowStartUp.test.ts) layers 1–4 RMS 1.07/1.67/0.48/1.05 → 1.09/1.68/0.46/1.00 %).
 */
function startUpFit(input: JointFitInput, robust: boolean): { delayS: number; result: JointFitResult } {
  const fits = START_DELAY_GRID_S.map((delayS) => (delayS > 0 ? onDelayClock(input, delayS, robust) : null));
  const ssr = fits.map((f) => (f && Number.isFinite(f.solver.ssr) ? f.solver.ssr : NaN));
  let k = -1;
  ssr.forEach((v, i) => {
    if (v < (k < 0 ? Infinity : ssr[k])) k = i;
  });
  if (k < 0) return { delayS: 0, result: fitHoldingDrifts(input, robust) };
  // (the grid's first point, δ = 0, is not fitted here: a best δ on the grid's second point has no vertex)
  const parabola = k + 1 < ssr.length ? gridParabola(ssr, k) : null;
  if (parabola && parabola.curvature > 0) {
    const result = onDelayClock(input, parabola.vertexS, robust);
    if (result.solver.ssr < ssr[k]) return { delayS: parabola.vertexS, result };
  }
  return { delayS: START_DELAY_GRID_S[k], result: fits[k]! };
}

/**
 * The window with one gain G·(1 + γ·t) for its layers, G under the bare chip's σ about the chip's
 * calibrated gain and γ under the lamp drift's prior, where every layer of it holds the chip's
 * gain (a level cut in transmittance, fit/levelCutGain.ts) and the prior is known; else as it is.
 */
function withLampDrift(input: JointFitInput, lamp: PairPart['lampDrift']): JointFitInput {
  if (!lamp || !input.layers.every((l) => l.heldGain !== null)) return input;
  const { chipGain, chipGainSigma, prior, noiseSigma } = lamp;
  return {
    ...input, gainPrior: undefined,
    sharedGain: {
      gain: chipGain, driftPerS: prior.meanPerS, fitDrift: true, driftPrior: { meanPerS: prior.meanPerS, sigmaPerS: prior.sigmaPerS },
      gainPrior: { mean: chipGain, sigma: Math.max(chipGainSigma, 1e-6 * Math.abs(chipGain)), noiseSigma },
    },
  };
}

/**
 * Whether a window's layers share one gain: in reflectance, each with a gain of its own under the
 * pass's prior. A level cut's end level in reflectance is a small reflectance times the gain, so a
 * gain of its own (free within the prior's 0.5 %) trades against the thin stack below, whose
 * admittance the window reads; the lamp and detector are the chip's, one gain for the window
 * (with the chip's held drift), as refit's final joint fit and reflectanceChipGain take it. Thin
 * level cuts in R, seeds 71–86: layer 3 (1.2 QWOT on a 0.4-QWOT layer) RMS 1.53 → 0.70 %, cut max
 * 2.71 → 1.63 % QWOT; every layer's RMS lower; with the simulator's lamp drifting +1 %/h, max
 * 3.35 → 3.07 %, RMS 1.34 → 0.91 %; −1 %/h with stray light 0.2 %, 3.67 → 3.43 %, 1.58 → 1.16 %
 * (the held drift in the window's gain). Not in transmittance: the four-layer AR without a
 * layer column, seeds 33–44, its last layer (1.03 QWOT, cut just past its turning point) went
 * 0.50 → 0.63 % RMS, max 0.93 → 1.57 %.
 */
function sharesGain(layers: readonly FitLayerData[], gainPrior: PairPart['gainPrior']): boolean {
  return !!gainPrior && layers.length > 1 && layers.every((l) => l.optics.mode === 'R' && l.heldGain === null);
}

/** The window's one gain G (at the chip's reference time: G·(1 + γ·t) with the chip's held drift γ) under the pass's prior about the first layer's start gain. */
function windowGain(first: FitLayerData, startGain: number, prior: NonNullable<PairPart['gainPrior']>): SharedGain {
  const driftPerS = first.gainDriftPerS ?? 0;
  const gain = startGain / (1 + driftPerS * first.chipTimeS);
  return { gain, driftPerS, fitDrift: false, gainPrior: { mean: gain, sigma: prior.fraction * Math.abs(gain), noiseSigma: prior.noiseSigma } };
}

/**
 * A window's χ² gain (startUpGainChi2) past which its chip shows the start-up. Measured on the
 * chamber simulator, the largest window's gain per run: real-chamber BBAR (ramp 1.5 s) seeds
 * 21–36 8.5–20.7; without a ramp, white-noise BBAR seeds 11–26 at most 3.2, the same without a
 * layer column seeds 33–44 6.7, thin level cuts in R seeds 71–82 5.7 (the pooled profile of one δ
 * for the chip, as fit/jointStartDelay.ts pools, put that run at 14.2 and a ramped one at 7.5).
 * A threshold read off the simulator, not derived: as a likelihood ratio for one parameter it sits
 * near p = 0.006 under χ²₁ (a profile over a grid of δ is not quite χ²₁), and the margin between
 * the cases measured is narrow (6.7 against 8.5), so a chamber whose ramp is weaker may pass it,
 * its windows then read without the start-up (as before this option read it), and a run without
 * one may cross it (the no-layer-column BBAR's misplaced boundaries do on some seeds; read on a δ's
 * clock there, seeds 101–112, max 2.21 → 1.84 %).
 */
export const START_UP_GAIN_CHI2 = 7.5;

/**
 * How much the window's χ² falls when its upper layers are read on the exposure clock of a start
 * delay δ (fit/startTransient.ts; the best δ on START_DELAY_GRID_S past 0), in units of the fit's
 * residual variance times its residuals' autocorrelation time (as fit/jointStartDelay.ts); 0
 * where no δ lowers it.
 */
export function startUpGainChi2(input: JointFitInput, at0: JointFitResult, robust: boolean): number {
  return startUpGain(input, at0, robust).gain;
}

/** startUpGainChi2, with the best δ's fit (startUpFit). */
function startUpGain(input: JointFitInput, at0: JointFitResult, robust: boolean): { gain: number; delayS: number; result: JointFitResult } {
  let tau = 0, points = 0;
  at0.layers.forEach((l, k) => {
    tau += Math.max(1, l.noiseCorrelation) * input.layers[k].y.length;
    points += input.layers[k].y.length;
  });
  const unit = (at0.solver.ssr / Math.max(at0.solver.dof, 1)) * (tau / Math.max(points, 1));
  if (!(unit > 0)) return { gain: 0, delayS: 0, result: at0 };
  const found = startUpFit({ ...input, start: at0.layers }, robust);
  return { ...found, gain: Math.max(0, (at0.solver.ssr - found.result.solver.ssr) / unit) };
}
