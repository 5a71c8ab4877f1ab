import { type LayerAt } from '../optics';
import { invertSymmetric } from './invertSymmetric';
import { layerJacobian } from './layerJacobian';
import { evaluateLayers, paramLayout, type FitLayerData } from './layerModel';

/** One layer's converged fit on the stack under it: what a reading of that stack from the layer's data starts from. */
export interface LayerOnStackFit {
  /** The stack under the layer, at its wavelength. */
  below: readonly LayerAt[];
  /** The layer fitted on that stack, and its fitted parameters (fitLayers' vector for this one layer). */
  layer: FitLayerData;
  params: ArrayLike<number>;
  offsetSignal: number;
  /** The gain prior's c of the fit (see fitLayers), 0 without one. */
  gainPriorWeight: number;
  /** Residual variance per fit point (SSR/dof) and the residuals' autocorrelation time in fit points. */
  residualVariance: number;
  noiseCorrelation: number;
}

/** `below`'s last entry is the layer below, whose end is sought. */
export interface GrowthFromNextInput extends LayerOnStackFit {
  /**
   * The covariance of the (index, thickness) pairs of the chip's layers, the last entries of
   * `below` (stackUncertainty's StackCovariance), when known: their uncertainty is carried into
   * the growth's σ, all but the thickness of the layer below itself (which the growth corrects).
   */
  stack?: { size: number; cov: Float64Array };
}

export interface GrowthFromNext {
  /** Thickness to add to the layer below (to its current value in `below`), nm, and its 1σ. */
  deltaNm: number;
  sigmaNm: number;
}

/**
 * What a layer's own curve says about the thickness of the layer below it: the stack under it
 * sets where on its fringe it starts (its first level and its first slope), so its data carry
 * the thickness grown after the cut of the layer below. After a cut at a turning point the
 * stack's admittance is real and the new layer starts at an extremum of its own curve; a
 * thickness δ more below moves the admittance off the real axis, and the new layer starts with
 * a slope proportional to δ, which no parameter of the layer itself can make (its thickness is
 * 0 at its start). Hence δ is determined to first order even where the idle level after the cut
 * tells it only to second order.
 *
 * One Gauss–Newton step from the converged fit, with δ as one more parameter: the normal
 * matrix of (θ, δ) is built from the Jacobian at the solution (the layer's own gain prior
 * included), the gradient in θ is zero there, so the step in δ is [A⁻¹]_δδ·J_δᵀr and its
 * variance s²·τ·[A⁻¹]_δδ (the least-squares covariance, scaled for correlated noise as the
 * layer's own σ are). The model is linear in δ to well within its σ over the fraction of a
 * nanometre a shutter adds. Null when the normal matrix is singular.
 */
export function growthFromNext(input: GrowthFromNextInput): GrowthFromNext | null {
  const { below, layer, offsetSignal } = input;
  if (below.length === 0) return null;
  const layout = paramLayout([layer]);
  const np = layout.count;
  const n = layer.tauS.length;
  const params = Float64Array.from(input.params);
  const { at, jt } = layerJacobian(below, layer, layout, params, offsetSignal);
  // ∂model/∂δ by a central difference (the model is smooth on the scale of h).
  const h = 0.01;
  const plus = new Float64Array(n), minus = new Float64Array(n);
  const moved = (dd: number) => below.map((l, i) => (i === below.length - 1 ? { ...l, thicknessNm: l.thicknessNm + dd } : l));
  evaluateLayers(moved(h), [layer], layout, params, offsetSignal, plus);
  evaluateLayers(moved(-h), [layer], layout, params, offsetSignal, minus);
  const m = np + 1;
  // the columns: the layer's Jacobian, then ∂model/∂δ
  const cols = new Float64Array(m * n);
  cols.set(jt.subarray(0, np * n));
  centralDifference(plus, minus, h, cols, np * n);
  const a = new Float64Array(m * m);
  for (let p = 0; p < m; p++) {
    for (let q = p; q < m; q++) a[p * m + q] = a[q * m + p] = columnProduct(cols, p * n, q * n, n);
  }
  // The gain prior is a pseudo-observation on the gain, the layer's last parameter when free.
  if (layer.heldGain === null && input.gainPriorWeight > 0) a[(np - 1) * m + np - 1] += input.gainPriorWeight ** 2;
  const inv = invertSymmetric(a, m);
  if (!inv) return null;
  const w = layer.weight ?? 1;
  const g = dotWithResiduals(cols, np * n, layer.y, w, at, n);
  const cdd = inv[m * m - 1];
  let variance = input.residualVariance * Math.max(1, input.noiseCorrelation) * cdd;
  const stack = input.stack;
  if (stack && stack.size >= 2 && stack.size / 2 <= below.length) {
    // First-order sensitivity of δ to the stack s, −[A⁻¹·Jᵀ·J_s]_δ (as in stackUncertainty), then sᵀ·Σ·s.
    const k = stack.size / 2, offset = below.length - k;
    const sens = new Float64Array(stack.size);
    const shifted = new Float64Array(n);
    for (let c = 0; c < stack.size - 1; c++) {
      const b = offset + (c >> 1), isIndex = c % 2 === 0, step = isIndex ? 1e-5 : 1e-3;
      const moved2 = below.map((l, i) => (i !== b ? l : isIndex ? { ...l, n: { re: l.n.re + step, im: l.n.im } } : { ...l, thicknessNm: l.thicknessNm + step }));
      evaluateLayers(moved2, [layer], layout, params, offsetSignal, shifted);
      let v = 0;
      for (let q = 0; q < m; q++) v -= inv[(m - 1) * m + q] * (dotWithChange(cols, q * n, shifted, at, n) / step);
      sens[c] = v;
    }
    for (let a = 0; a < stack.size - 1; a++) for (let b = 0; b < stack.size - 1; b++) variance += sens[a] * sens[b] * stack.cov[a * stack.size + b];
  }
  if (!(cdd > 0) || !Number.isFinite(variance)) return null;
  return { deltaNm: cdd * g, sigmaNm: Math.sqrt(variance) };
}

// The loops over the samples sit in small functions of their own: growthFromNext runs once a
// layer, and with them inline the engine compiled the whole of it (the same sums, in row order).

/** J[row + i] = (plus[i] − minus[i])/(2h). */
function centralDifference(plus: Float64Array, minus: Float64Array, h: number, J: Float64Array, row: number): void {
  for (let i = 0; i < plus.length; i++) J[row + i] = (plus[i] - minus[i]) / (2 * h);
}

/** Σ J[oa + i]·J[ob + i] over i < n. */
function columnProduct(J: Float64Array, oa: number, ob: number, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += J[oa + i] * J[ob + i];
  return s;
}

/** Σ J[o + i]·(w·y[i] − at[i]) over i < n. */
function dotWithResiduals(J: Float64Array, o: number, y: ArrayLike<number>, w: number, at: Float64Array, n: number): number {
  let g = 0;
  for (let i = 0; i < n; i++) g += J[o + i] * (w * y[i] - at[i]);
  return g;
}

/** Σ J[o + i]·(shifted[i] − at[i]) over i < n. */
function dotWithChange(J: Float64Array, o: number, shifted: Float64Array, at: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += J[o + i] * (shifted[i] - at[i]);
  return s;
}
