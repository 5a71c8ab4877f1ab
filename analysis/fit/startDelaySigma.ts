import { fitLayers, type JointFitResult, type LayerEstimate, type SharedGain } from './fitLayers';
import { evaluateLayers, paramLayout, type FitLayerData } from './layerModel';
import { layerChangesFor, type LayerChange } from './solutionShift';
import { START_DELAY_GRID_S, unresolvedDelaySigma, unresolvedLevelDelaySigma, type PooledStartDelay } from './startDelay';
import { exposureTime, realTime } from './startTransient';

/**
 * A layer's fit data moved from the exposure clock of delay δ to that of δ' (fit/startTransient.ts):
 * each point's exposure time read back to real time and forward again, E' = E_δ'(E_δ⁻¹(E)), and
 * the layer's duration likewise. Bin means τ̄ are mapped as points: inside the first 2δ the map
 * is linear (E' = E·δ/δ'), after it a shift (E' = E − (δ' − δ)), so a bin's mean maps exactly
 * except for the one bin that straddles 2δ.
 */
export function onMovedClock(data: FitLayerData, delayS: number, movedS: number): FitLayerData {
  const move = (e: number) => exposureTime(realTime(e, delayS), movedS);
  return { ...data, tauS: data.tauS.map(move), durationS: move(data.durationS) };
}

/** σ² += Δ² for each figure of an estimate, Δ its change with the delay one σ longer. */
function addShift(e: LayerEstimate, m: LayerEstimate): void {
  addChange(e, { thicknessNm: m.thicknessNm - e.thicknessNm, opticalThicknessNm: m.opticalThicknessNm - e.opticalThicknessNm, index: m.index - e.index, rateNmPerS: m.rateNmPerS - e.rateNmPerS });
}

/**
 * The start delay's own σ into each layer's figures (the fits held the delay as exact), by
 * first-order propagation, as fit/offsetSigma.ts does for the offset: the fit again with every
 * point on the clock of δ + σ_δ, started from its converged estimates, and each figure's change
 * Δθ = ∂θ/∂δ · σ_δ + O(σ_δ²) added in quadrature. At the converged θ̂ the gradient Jᵀr vanishes,
 * so the refit's step −(JᵀJ)⁻¹Jᵀ·r(θ̂, δ + σ) is −(JᵀJ)⁻¹Jᵀ·∂r/∂δ·σ to first order: the implicit
 * derivative of the minimum in δ, the same first-order change a whole pass at δ + σ gives for the
 * fit (that pass differs in where each fit starts, not in its minimum; it also moves the stack
 * below in sequential mode and the growths read after the cuts, which here stay as held).
 * Measured against that pass on the bench's 40-layer chamber run (δ̂ 1.25 ± 0.37 s): each
 * layer's whole thickness σ within 0.72–1.08× of it in refit (median 0.98), 0.77–1.14× in
 * sequential (median 1.02); δ's share alone differs more (refit median 0.7×), where the pass's
 * growths re-read after the cuts moved with δ; 3σ coverage the same (40/40 refit, 36/40 sequential).
 * `refit` fits the moved data from the estimates (analyzeRun's fit of a layer, or the chip's joint
 * fit); only the layers `onClock` (fitted on the exposure clock) are moved.
 */
export function carryStartDelaySigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], delayS: number, sigmaS: number, onClock: readonly boolean[],
  refit: (moved: FitLayerData[]) => JointFitResult,
): void {
  if (!(sigmaS > 0) || !Number.isFinite(sigmaS) || estimates.length === 0 || !onClock.some(Boolean)) return;
  const moved = refit(data.map((d, j) => (onClock[j] ? onMovedClock(d, delayS, delayS + sigmaS) : d)));
  if (!Number.isFinite(moved.solver.ssr)) return;
  estimates.forEach((e, j) => addShift(e, moved.layers[j]));
}

/**
 * carryStartDelaySigma after a chip's final joint fit (the chip-wide gain refitted with the layers, as in the fit).
 * With `joint`, the chip's final joint fit (not robust), the moved solution is one Gauss–Newton step
 * from it (delayShift), which the refit's is to first order in σ_δ, as in fit/offsetSigma.ts;
 * without it, the joint fit is repeated on the moved data, started from `estimates`.
 */
export function carryJointStartDelaySigma(
  data: readonly FitLayerData[], estimates: LayerEstimate[], offset: number, delayS: number, sigmaS: number, onClock: readonly boolean[],
  sharedGain: SharedGain | null, robust: boolean, joint?: JointFitResult,
): void {
  if (!(sigmaS > 0) || !Number.isFinite(sigmaS) || estimates.length === 0 || !onClock.some(Boolean)) return;
  const step = !robust && joint ? delayShift(data, joint, offset, delayS, sigmaS, onClock, sharedGain) : null;
  if (step) {
    estimates.forEach((e, j) => addChange(e, step[j]));
    return;
  }
  carryStartDelaySigma(data, estimates, delayS, sigmaS, onClock, (moved) => fitLayers(
    { fixedBelow: [], layers: moved, start: estimates, offsetSignal: offset, ...(sharedGain ? { sharedGain: { ...sharedGain } } : {}) },
    { robust, maxIterations: 30 },
  ));
}

/** σ² += Δ² for each figure of an estimate, Δ its linearised change. */
function addChange(e: LayerEstimate, c: LayerChange): void {
  const add = (sigma: number, delta: number) => (Number.isFinite(delta) ? Math.hypot(sigma, delta) : sigma);
  e.thicknessSigmaNm = add(e.thicknessSigmaNm, c.thicknessNm);
  e.opticalThicknessSigmaNm = add(e.opticalThicknessSigmaNm, c.opticalThicknessNm);
  e.indexSigma = add(e.indexSigma, c.index);
  e.rateSigma = add(e.rateSigma, c.rateNmPerS);
}

/**
 * The joint fit's solution with every point of the layers on the clock of δ + σ_δ, linearised:
 * the model at the fit's solution moves by Δmodel from the moved clocks (the layers' own points,
 * and their end thicknesses under the layers above), as if the data fell by as much, so the
 * solution moves by Δθ = (JᵀJ)⁻¹Jᵀ·(−Δmodel) (LeastSquaresResult.shiftFor; the gradient is zero at
 * the solution). Each end thickness is read at the moved duration. Null when the step cannot be
 * taken (a singular normal matrix, a layout that is not the fit's).
 */
function delayShift(
  data: readonly FitLayerData[], joint: JointFitResult, offset: number, delayS: number, sigmaS: number, onClock: readonly boolean[],
  sharedGain: SharedGain | null,
): LayerChange[] | null {
  const { solver } = joint;
  const layout = paramLayout(data, sharedGain !== null, sharedGain?.fitDrift ?? false);
  if (layout.count !== solver.params.length) return null;
  let n = 0;
  for (const l of data) n += l.tauS.length;
  const moved = data.map((d, j) => (onClock[j] ? onMovedClock(d, delayS, delayS + sigmaS) : d));
  const at = new Float64Array(n), there = new Float64Array(n);
  evaluateLayers([], data, layout, solver.params, offset, at);
  evaluateLayers([], moved, layout, solver.params, offset, there);
  // the fit's rows: the samples, then its priors' pseudo-observations (which the clock leaves)
  const dy = new Float64Array(solver.residuals.length);
  for (let i = 0; i < n; i++) dy[i] = at[i] - there[i];
  return layerChangesFor(data, solver, layout, dy, moved);
}

/**
 * The run's note on the start transient (a warning line: shared/FORMATS.md fixes no other field); `over`: what was pooled (layers,
 * or chips' joint fits); `driftOnly`: where kept, only the gain drift at δ̂ was taken (sequential level cuts), the layers on real time;
 * `optionOff`: a run cut on level without option levelStartTransient, its delay not applied whatever the profile (its σ carried).
 * A note, listed apart from the warnings (fit/analysisNotes.ts).
 */
export function startDelayNote(p: PooledStartDelay, over: 'layer' | 'chip' = 'layer', driftOnly = false, optionOff = false): string {
  const found = `start transient: the rate reaches its full value as if the shutter opened ${p.delayS.toFixed(2)} ± ${p.sigmaS.toFixed(2)} s late ` +
    `(pooled over ${p.layers} ${over === 'chip' ? (p.layers === 1 ? 'chip\'s joint fit' : 'chips\' joint fits') : 'layers'}${p.shutterS !== null ? `, with growth after turning-point cuts of ${p.shutterS.toFixed(2)} s at the full rate` : ''}, χ² lower by ${p.gainChi2.toFixed(1)}${over === 'layer' && p.dispersion > 1 ? `, ${(p.gainChi2 / p.dispersion).toFixed(1)} on the layers' own scatter` : ''})`;
  if (p.kept && !optionOff && driftOnly) return `${found}; each chip's gain drift held at its value there, the layers fitted on real time`;
  if (p.kept && !optionOff) return `${found}; every layer fitted with it`;
  const firstStep = START_DELAY_GRID_S[1];
  const carried = over === 'layer' ? unresolvedDelaySigma(p) : unresolvedLevelDelaySigma(p);
  const why = p.delayS > 0 && p.delayS < firstStep && p.gainChi2 / p.dispersion > p.marginChi2 ? `inside the profile grid's first step of ${firstStep} s` : `not above the margin of ${p.marginChi2.toFixed(1)}`;
  const fate = optionOff ? 'not applied (option levelStartTransient off)' : `not kept (${why})`;
  return `${found}: ${fate}; layers fitted without it${carried > 0 ? `, δ's root mean square about 0, ${carried.toFixed(2)} s, carried into their σ` : ''}`;
}
