import { indexAtMemo, type MaterialModel } from '../materials';
import { type LayerAt } from '../optics';
import { type JointFitResult, type LayerEstimate } from './fitLayers';
import { factorShiftBasis, shiftWith, type LeastSquaresResult, type ShiftBasis } from './leastSquares';
import { evaluateLayers, fitLayerData, paramLayout, type FitLayerData } from './layerModel';
import { wanderBasis, wanderCount, type RateWander } from './rateWander';
import { layerChangesFor } from './solutionShift';

/** Variances of each layer's figures from a wander the fit does not model, nm² (index: unitless²). */
export interface WanderErrorVariance {
  index: number;
  thicknessNm2: number;
  opticalNm2: number;
}

/** What wanderErrorVariances reads of a joint fit. */
type JointFitRead = {
  layers: readonly Pick<JointFitResult['layers'][number], 'index'>[];
  solver: Pick<LeastSquaresResult, 'params' | 'shiftFor'> & { residuals: { length: number } };
};

/**
 * What a rate wander that the fit's law d = r·τ + a·τ²/2 cannot follow costs each layer's figures,
 * as variances, the point estimates unchanged. The wander of layer j is Ornstein–Uhlenbeck
 * (G. E. Uhlenbeck & L. S. Ornstein, Phys. Rev. 36, 823 (1930)) in the non-centred knots of
 * fit/rateWander.ts, c = σ_w·L·v with v unit normal, so its thickness is Σ_k v_k·Ψ_k(τ). Each v_k
 * at 1 moves the data by Δy_k (the model with that wander less the model without, on every layer
 * from j up: it also moves the stack the later layers grow on); the fit answers, to first order, by
 * one Gauss–Newton step Δθ_k = (JᵀJ)⁻¹Jᵀ·Δy_k (fit/solutionShift.ts), while the true end
 * thickness moved by Ψ_k(T_j). The error e_k = Δd_k − Ψ_k(T_j) (index: Δn_k; optical:
 * Δ(nd)_k − n·Ψ_k(T_j)), and with the v_k independent unit normals Var = Σ_k e_k²: the
 * random-effects variance propagated through the fit's linearisation, J·G·Jᵀ (e.g.
 * C. R. Rao, "Linear Statistical Inference and its Applications", 2nd ed., Wiley (1973), §1b.2, from
 * memory, for the variance of a linear function of a random vector).
 * `wanders[j]` is layer j's wander (null: none); the layers' data must not hold wander parameters.
 * Null when the fit cannot take the step.
 */
export function wanderErrorVariances(
  below: readonly LayerAt[], data: readonly FitLayerData[], joint: JointFitRead, offsetSignal: number,
  wanders: readonly (RateWander | null)[], sharedGain: { fitDrift: boolean } | null,
): WanderErrorVariance[] | null {
  const { solver } = joint;
  if (data.some((d) => wanderCount(d.wander) > 0)) return null;
  const layout = paramLayout(data, sharedGain !== null, !!sharedGain?.fitDrift);
  if (layout.count !== solver.params.length) return null;
  const rows = data.reduce((s, d) => s + d.tauS.length, 0);
  const base = new Float64Array(rows);
  evaluateLayers(below, data, layout, solver.params, offsetSignal, base);
  const out: WanderErrorVariance[] = data.map(() => ({ index: 0, thicknessNm2: 0, opticalNm2: 0 }));
  const moved = new Float64Array(rows);
  const dy = new Float64Array(solver.residuals.length);
  data.forEach((d, j) => {
    const w = wanders[j];
    if (!w || !(w.sigmaNmPerS > 0)) return;
    const K = w.knotsS.length;
    const psi = wanderBasis(w, d.durationS, new Float64Array(K));
    for (let k = 0; k < K; k++) {
      const v = new Float64Array(K);
      v[k] = 1;
      const withW = data.map((l, i) => (i === j ? { ...l, wander: { ...w, fixed: v } } : l));
      moved.set(base);
      evaluateLayers(below, withW, layout, solver.params, offsetSignal, moved, j);
      dy.fill(0);
      for (let i = 0; i < rows; i++) dy[i] = moved[i] - base[i];
      const change = layerChangesFor(data, solver, layout, dy);
      if (!change) return;
      change.forEach((c, i) => {
        const trueD = i === j ? psi[k] : 0;
        const n = joint.layers[i].index;
        out[i].index += c.index ** 2;
        out[i].thicknessNm2 += (c.thicknessNm - trueD) ** 2;
        out[i].opticalNm2 += (c.opticalThicknessNm - n * trueD) ** 2;
      });
    }
  });
  return out;
}

/** The variances added to an estimate's σ in quadrature (in place). */
export function addWanderVariance(e: LayerEstimate, v: WanderErrorVariance): void {
  if (!(v.thicknessNm2 > 0) || !Number.isFinite(v.thicknessNm2)) return;
  e.indexSigma = Math.sqrt(e.indexSigma ** 2 + v.index);
  e.thicknessSigmaNm = Math.sqrt(e.thicknessSigmaNm ** 2 + v.thicknessNm2);
  e.opticalThicknessSigmaNm = Math.sqrt(e.opticalThicknessSigmaNm ** 2 + v.opticalNm2);
}

/**
 * A chip's wanderErrorVariances as plain data, so another thread can compute it
 * (AnalyzeOptions.wanderVariancesOf) while this one fits the next chips: the layers' fit data less
 * their index functions (each layer's material instead), the joint fit's solution and the basis
 * of its Gauss–Newton steps (factored here first, so every step forms its product alike wherever
 * it runs), copied field by field at the time of asking. Null where the fit keeps no basis.
 */
export interface WanderVariancesRequest {
  layers: Omit<FitLayerData, 'nominalAt'>[];
  materials: MaterialModel[];
  params: Float64Array;
  rows: number;
  indices: number[];
  basis: ShiftBasis;
  offsetSignal: number;
  wanders: (RateWander | null)[];
  sharedGain: { fitDrift: boolean } | null;
}

export function wanderVariancesRequest(
  data: readonly FitLayerData[], materials: readonly MaterialModel[], joint: JointFitResult, offsetSignal: number,
  wanders: readonly (RateWander | null)[], sharedGain: { fitDrift: boolean } | null,
): WanderVariancesRequest | null {
  const basis = joint.solver.shiftBasis;
  if (!basis) return null;
  factorShiftBasis(basis);
  return {
    layers: data.map(({ nominalAt: _n, ...l }) => ({ ...l })), materials: [...materials], params: Float64Array.from(joint.solver.params),
    rows: joint.solver.residuals.length, indices: joint.layers.map((e) => e.index), basis, offsetSignal,
    wanders: [...wanders], sharedGain: sharedGain ? { fitDrift: sharedGain.fitDrift } : null,
  };
}

/** wanderErrorVariances of a request (here or on another thread): the same figures. */
export function wanderVariancesFromRequest(r: WanderVariancesRequest): WanderErrorVariance[] | null {
  const data = r.layers.map((l, j) => fitLayerData({ ...l, nominalAt: indexAtMemo(r.materials[j]) }));
  const basis = r.basis;
  const joint: JointFitRead = {
    layers: r.indices.map((index) => ({ index })),
    solver: { params: r.params, residuals: { length: r.rows }, shiftFor: (dy: ArrayLike<number>) => shiftWith(basis, dy) },
  };
  return wanderErrorVariances([], data, joint, r.offsetSignal, r.wanders, r.sharedGain);
}
