import { invertSymmetric } from './invertSymmetric';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { layerJacobian } from './layerJacobian';
import { evaluateLayers, paramLayout, type FitLayerData } from './layerModel';
import { type StackCovariance } from './stackUncertainty';
import { type LayerOnStackFit } from './growthFromNext';
import { wanderCount } from './rateWander';

/** `below` as it now stands (the prior's mean plus `shift`); the chip's fitted layers are its last stack.size/2 entries. */
export interface StackPosteriorInput extends LayerOnStackFit {
  /** The prior on the chip's layers' (n, d): the stack covariance the pass carried (stackUncertainty). */
  stack: StackCovariance;
  /** How far `below` already stands from the prior's mean, per entry of the stack (n, d per layer); zeros on the first step. */
  shift: Float64Array;
  /**
   * What the pass holds with a σ carried (the chip's gain drift, its held gain, its offset): the
   * layer as fitted with each one σ off (the same parameters). Each is one more direction of the
   * update under a unit prior, profiled out (its move not applied), so the misfit it would make
   * is not read as the stack's.
   */
  nuisances?: readonly Nuisance[];
}

/** A quantity the pass holds with a σ: the layer's data as fitted with it one σ off. */
export interface Nuisance {
  layer: FitLayerData;
  offsetSignal: number;
}

export interface StackPosteriorStep {
  /** The stack's shift from the prior's mean after this step (n, d per layer, stack order). */
  shift: Float64Array;
  /** The step taken, the largest change of an entry over its prior σ: small when converged. */
  stepSize: number;
  /** The posterior covariance of the stack's (n, d), row-major like StackCovariance.cov. */
  cov: Float64Array;
}

/**
 * The stack below a sequentially fitted layer read again with that layer's own data. The pass
 * holds the stack at its estimate ŝ and carries its covariance Σ into the layer's σ
 * (stackUncertainty); but the layer's curve (its start level, its extrema, their spacing) also
 * tells the admittance it grows on, and in reflectance a thin stack below moves a near-extremum
 * level cut of the next layer by several times its own error (a 0.4-QWOT layer 1 % thin put
 * the 1.2-QWOT layer above it 4–5 % thick on the chamber simulator). Here the stack is a
 * Gaussian prior N(ŝ, Σ) and the layer's parameters θ are profiled out: one Gauss–Newton step
 * of min |r(θ, s)|²/s² + (s − ŝ)ᵀΣ⁻¹(s − ŝ) in s, from θ converged at the current s (its
 * gradient zero there), with s = ŝ + V·√Λ·u over Σ's eigenvectors (a held or fully correlated
 * entry has no direction to move in): the profile's Jacobian J_r = (I − J_θA⁻¹J_θᵀ)·J_s, the
 * step v = (Lᵀ J_rᵀ J_r L + s²I)⁻¹(Lᵀ J_sᵀ r − s²u), the posterior s²(Lᵀ J_rᵀ J_r L + s²I)⁻¹ in
 * u (the linear-Gaussian update, e.g. A. Tarantola, "Inverse Problem Theory", SIAM (2005), §3.2,
 * from memory). s² is the residual variance times the residuals' correlation time, as the
 * layer's own σ count it. Null where the stack is empty or the normal matrix singular.
 */
export function stackPosteriorStep(input: StackPosteriorInput): StackPosteriorStep | null {
  const { below, layer, offsetSignal, stack } = input;
  const ms = stack.size;
  const k = ms / 2;
  if (ms === 0 || k > below.length) return null;
  const nuisances = input.nuisances ?? [];
  const m = ms + nuisances.length;
  const layout = paramLayout([layer]);
  const np = layout.count;
  const n = layer.tauS.length;
  const params = Float64Array.from(input.params);
  const { at, jt } = layerJacobian(below, layer, layout, params, offsetSignal);
  // J_s: ∂model/∂(n, d) of each of the chip's layers below, forward differences as in stackUncertainty.
  const js = new Float64Array(m * n);
  const shifted = new Float64Array(n);
  const offset = below.length - k;
  for (let c = 0; c < ms; c++) {
    const b = offset + (c >> 1), isIndex = c % 2 === 0, h = isIndex ? 1e-5 : 1e-3;
    const moved = below.map((l, i) => (i !== b ? l : isIndex ? { ...l, n: { re: l.n.re + h, im: l.n.im } } : { ...l, thicknessNm: l.thicknessNm + h }));
    evaluateLayers(moved, [layer], layout, params, offsetSignal, shifted);
    for (let i = 0; i < n; i++) js[c * n + i] = (shifted[i] - at[i]) / h;
  }
  nuisances.forEach((q, j) => {
    evaluateLayers(below, [q.layer], layout, params, q.offsetSignal, shifted);
    for (let i = 0; i < n; i++) js[(ms + j) * n + i] = shifted[i] - at[i];
  });
  // the prior: the stack's covariance, and each nuisance at unit σ (its column is per σ)
  const prior = new Float64Array(m * m);
  for (let p = 0; p < ms; p++) for (let q = 0; q < ms; q++) prior[p * m + q] = stack.cov[p * ms + q];
  for (let j = ms; j < m; j++) prior[j * m + j] = 1;
  const current = new Float64Array(m);
  current.set(input.shift.subarray(0, ms));
  // A = J_θᵀJ_θ with the fit's own priors (the gain's pseudo-observation, the wander's ridge).
  const a = new Float64Array(np * np);
  for (let p = 0; p < np; p++) for (let q = p; q < np; q++) a[p * np + q] = a[q * np + p] = dot(jt, p, jt, q, n);
  if (layer.heldGain === null && input.gainPriorWeight > 0) a[(np - 1) * np + np - 1] += input.gainPriorWeight ** 2;
  const wk = wanderCount(layer.wander), iW = (layer.heldIndex === null ? 1 : 0) + 1 + (layer.fitDrift ? 1 : 0);
  for (let j = 0; j < wk; j++) a[(iW + j) * np + iW + j] += layer.wander!.pointSigma ** 2;
  const ainv = invertSymmetric(a, np);
  if (!ainv) return null;
  // J_r = J_s − J_θ·A⁻¹·J_θᵀJ_s: the change of the residuals with s, θ following it.
  const jr = Float64Array.from(js);
  for (let c = 0; c < m; c++) {
    const b = new Float64Array(np);
    for (let p = 0; p < np; p++) b[p] = dot(jt, p, js, c, n);
    const x = new Float64Array(np);
    for (let p = 0; p < np; p++) for (let q = 0; q < np; q++) x[p] += ainv[p * np + q] * b[q];
    for (let p = 0; p < np; p++) {
      if (x[p] === 0) continue;
      for (let i = 0; i < n; i++) jr[c * n + i] -= jt[p * n + i] * x[p];
    }
  }
  // L = V·√Λ: Σ's principal axes (directions of zero variance dropped).
  // Σ's eigen-decomposition (ml-matrix's symmetric tridiagonal QL, after EISPACK's tql2).
  const priorRows = Array.from({ length: m }, (_, i) => Array.from(prior.slice(i * m, (i + 1) * m)));
  const eig = new EigenvalueDecomposition(new Matrix(priorRows), { assumeSymmetric: true });
  const values = eig.realEigenvalues;
  const vectors = Float64Array.from(eig.eigenvectorMatrix.to1DArray());
  const top = Math.max(...values);
  const axes: number[] = [];
  for (let j = 0; j < m; j++) if (values[j] > 1e-12 * top && values[j] > 0) axes.push(j);
  const r = axes.length;
  if (r === 0) return null;
  const L = new Float64Array(m * r);
  axes.forEach((j, c) => {
    const s = Math.sqrt(values[j]);
    for (let row = 0; row < m; row++) L[row * r + c] = vectors[row * m + j] * s;
  });
  // u_c = √Λ⁻¹·Vᵀ·shift
  const uc = new Float64Array(r);
  axes.forEach((j, c) => {
    let v = 0;
    for (let row = 0; row < m; row++) v += vectors[row * m + j] * current[row];
    uc[c] = v / Math.sqrt(values[j]);
  });
  // (J_r·L) and (J_s·L) as r columns over n rows
  const jrl = new Float64Array(r * n), jsl = new Float64Array(r * n);
  for (let c = 0; c < r; c++) {
    for (let row = 0; row < m; row++) {
      const l = L[row * r + c];
      if (l === 0) continue;
      for (let i = 0; i < n; i++) {
        jrl[c * n + i] += jr[row * n + i] * l;
        jsl[c * n + i] += js[row * n + i] * l;
      }
    }
  }
  const s2 = input.residualVariance * Math.max(1, input.noiseCorrelation);
  if (!(s2 > 0)) return null;
  const w = layer.weight ?? 1;
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) resid[i] = w * layer.y[i] - at[i];
  const hm = new Float64Array(r * r), g = new Float64Array(r);
  for (let p = 0; p < r; p++) {
    for (let q = p; q < r; q++) hm[p * r + q] = hm[q * r + p] = dot(jrl, p, jrl, q, n) + (p === q ? s2 : 0);
    g[p] = dot(jsl, p, resid, 0, n) - s2 * uc[p];
  }
  const hinv = invertSymmetric(hm, r);
  if (!hinv) return null;
  const v = new Float64Array(r);
  for (let p = 0; p < r; p++) for (let q = 0; q < r; q++) v[p] += hinv[p * r + q] * g[q];
  const shift = Float64Array.from(input.shift.subarray(0, ms));
  for (let row = 0; row < ms; row++) for (let c = 0; c < r; c++) shift[row] += L[row * r + c] * v[c];
  const cov = new Float64Array(ms * ms);
  for (let p = 0; p < ms; p++) {
    for (let q = p; q < ms; q++) {
      let s = 0;
      for (let a1 = 0; a1 < r; a1++) {
        const lp = L[p * r + a1];
        if (lp === 0) continue;
        for (let b1 = 0; b1 < r; b1++) s += lp * hinv[a1 * r + b1] * L[q * r + b1];
      }
      cov[p * ms + q] = cov[q * ms + p] = s2 * s;
    }
  }
  let stepSize = 0;
  for (let row = 0; row < ms; row++) {
    const sd = Math.sqrt(stack.cov[row * ms + row]);
    if (sd > 0) stepSize = Math.max(stepSize, Math.abs(shift[row] - input.shift[row]) / sd);
  }
  return { shift, stepSize, cov };
}

function dot(a: Float64Array, i: number, b: Float64Array, j: number, n: number): number {
  let s = 0;
  for (let x = 0, oa = i * n, ob = j * n; x < n; x++) s += a[oa + x] * b[ob + x];
  return s;
}
