import { type LayerAt } from '../optics';
import { type LayerEstimate } from './fitLayers';
import { invertSymmetric } from './invertSymmetric';
import { addHeldIndexSigma, type HeldIndexShift } from './thinLayer';
import { layerJacobian } from './layerJacobian';
import { evaluateLayers, paramLayout, type FitLayerData } from './layerModel';
import { wanderBasis, wanderCount } from './rateWander';

/**
 * The covariance of the (index, thickness) pairs of the layers fitted so far on one chip, in
 * deposition order: 2k×2k, row-major, index of layer i at 2i, thickness at 2i + 1.
 */
export interface StackCovariance {
  size: number;
  cov: Float64Array;
  /**
   * How the top layer's (n, d) move per unit of each entry below it (2 × (size − 2), row-major):
   * the sensitivity G·S of the carry that appended it, for an error the whole chip shares (the
   * gain drift, fit/gainDriftSigma.ts) to follow through the stack coherently.
   */
  sensitivity?: Float64Array;
}

export const emptyStack = (): StackCovariance => ({ size: 0, cov: new Float64Array(0) });

/**
 * Carries the uncertainty of the stack below into a sequentially fitted layer: its parameters θ
 * were fitted with the stack s below held at its estimate, so to first order
 * θ(s) = θ̂ + S·(s − ŝ) with S = −(JθᵀJθ)⁻¹·Jθᵀ·Js (the implicit-function sensitivity of a
 * least-squares estimate; e.g. Y. Bard, "Nonlinear Parameter Estimation", Academic Press (1974),
 * §7-2, from memory). The layer's (n, d) = G·θ then has covariance G·Cθ·Gᵀ + G·S·Σs·Sᵀ·Gᵀ and
 * cross-covariance G·S·Σs with the stack. Updates the estimate's σ in place and returns the
 * stack covariance with the layer appended. `gainPriorWeight` is the prior's c (see fitLayers);
 * `held`, a held index's σ and how the layer's estimates move with it (see heldIndexShift).
 */
export function carryStackUncertainty(
  below: readonly LayerAt[], layer: FitLayerData, estimate: LayerEstimate, params: Float64Array, paramCov: Float64Array,
  offsetSignal: number, stack: StackCovariance, gainPriorWeight = 0, held: { sigma: number; shift: HeldIndexShift } | null = null,
): StackCovariance {
  const layout = paramLayout([layer]);
  const np = layout.count;
  const n = layer.y.length;
  const k = stack.size / 2;
  // G: θ → (n, d); θ = [n?, r, a?, g?].
  const T = layer.durationS;
  const iN = layer.heldIndex === null ? 0 : -1;
  const iR = iN + 1;
  const iA = layer.fitDrift ? iR + 1 : -1;
  const G = new Float64Array(2 * np);
  if (iN >= 0) G[iN] = 1;
  G[np + iR] = T;
  if (iA >= 0) G[np + iA] = 0.5 * T * T;
  // θ also holds the wander's knots (d gains Σ v_j·Ψ_j(T)); their prior is a unit ridge of weight σ_point.
  const wk = wanderCount(layer.wander), iW = iR + (iA >= 0 ? 2 : 1);
  if (wk > 0) wanderBasis(layer.wander!, T, new Float64Array(wk)).forEach((g, j) => (G[np + iW + j] = g));
  const own = sandwich(G, paramCov, 2, np);
  let ownCov = own;
  let cross = new Float64Array(0);
  let sensitivity: Float64Array | undefined;
  if (k > 0) {
    const { at, jt } = layerJacobian(below, layer, layout, params, offsetSignal);
    // Js: the last k layers of `below` are the chip's fitted ones (earlier entries none here).
    const js = new Float64Array(2 * k * n);
    const shifted = new Float64Array(n);
    const offset = below.length - k;
    for (let b = 0; b < k; b++) {
      const entry = below[offset + b];
      for (const [col, apply] of [
        [2 * b, (l: LayerAt, h: number) => ({ ...l, n: { re: l.n.re + h, im: l.n.im } })],
        [2 * b + 1, (l: LayerAt, h: number) => ({ ...l, thicknessNm: l.thicknessNm + h })],
      ] as const) {
        const h = col % 2 === 0 ? 1e-5 : 1e-3;
        const moved = below.slice();
        moved[offset + b] = apply(entry, h);
        evaluateLayers(moved, [layer], layout, params, offsetSignal, shifted);
        for (let i = 0; i < n; i++) js[col * n + i] = (shifted[i] - at[i]) / h;
      }
    }
    const a = new Float64Array(np * np);
    for (let p = 0; p < np; p++) for (let q = p; q < np; q++) a[p * np + q] = a[q * np + p] = dot(jt, p, jt, q, n);
    if (layer.heldGain === null && gainPriorWeight > 0) a[(np - 1) * np + np - 1] += gainPriorWeight ** 2;
    for (let j = 0; j < wk; j++) a[(iW + j) * np + iW + j] += layer.wander!.pointSigma ** 2;
    const inv = invertSymmetric(a, np);
    if (inv) {
      const m = 2 * k;
      // S = −A⁻¹·Jθᵀ·Js (np × m), then GS = G·S (2 × m).
      const btj = new Float64Array(np * m);
      for (let p = 0; p < np; p++) for (let c = 0; c < m; c++) btj[p * m + c] = dot(jt, p, js, c, n);
      const gs = new Float64Array(2 * m);
      for (let r = 0; r < 2; r++) {
        for (let c = 0; c < m; c++) {
          let v = 0;
          for (let p = 0; p < np; p++) {
            let sp = 0;
            for (let q = 0; q < np; q++) sp += inv[p * np + q] * btj[q * m + c];
            v -= G[r * np + p] * sp;
          }
          gs[r * m + c] = v;
        }
      }
      sensitivity = gs;
      const carried = sandwich(gs, stack.cov, 2, m);
      ownCov = own.map((v, i) => v + carried[i]);
      cross = new Float64Array(2 * m);
      for (let r = 0; r < 2; r++) for (let c = 0; c < m; c++) {
        let v = 0;
        for (let q = 0; q < m; q++) v += gs[r * m + q] * stack.cov[q * m + c];
        cross[r * m + c] = v;
      }
    }
  }
  const varN = ownCov[0], varD = ownCov[3], covND = ownCov[1];
  estimate.indexSigma = Math.sqrt(Math.max(0, varN));
  estimate.thicknessSigmaNm = Math.sqrt(Math.max(0, varD));
  const nn = estimate.index, d = estimate.thicknessNm;
  estimate.opticalThicknessSigmaNm = Math.sqrt(Math.max(0, nn * nn * varD + d * d * varN + 2 * nn * d * covND));
  if (layer.heldIndex !== null && held && held.sigma > 0) {
    const extra = addHeldIndexSigma(estimate, held.sigma, held.shift);
    ownCov = ownCov.map((v, i) => v + extra[i]);
  }
  // The stack grows by the layer's (n, d).
  const m = stack.size, size = m + 2;
  const cov = new Float64Array(size * size);
  for (let r = 0; r < m; r++) for (let c = 0; c < m; c++) cov[r * size + c] = stack.cov[r * m + c];
  for (let r = 0; r < 2; r++) {
    for (let c = 0; c < m; c++) cov[(m + r) * size + c] = cov[c * size + m + r] = cross.length ? cross[r * m + c] : 0;
    for (let c = 0; c < 2; c++) cov[(m + r) * size + m + c] = ownCov[r * 2 + c];
  }
  return sensitivity ? { size, cov, sensitivity } : { size, cov };
}

/**
 * The shift of the top layer's (n, d, n·d) that shifts of the layers below it (`below`: n, d per
 * layer, stack order) bring through the stack's sensitivity, to first order; null where they do
 * not match.
 */
export function shiftThroughStack(stack: StackCovariance, below: Float64Array, index: number, thicknessNm: number): HeldIndexShift | null {
  const m = stack.size - 2;
  if (!stack.sensitivity || below.length !== m || m <= 0) return null;
  let dn = 0, dd = 0;
  for (let c = 0; c < m; c++) {
    dn += stack.sensitivity[c] * below[c];
    dd += stack.sensitivity[m + c] * below[c];
  }
  return { index: dn, thicknessNm: dd, opticalNm: index * dd + thicknessNm * dn };
}

function dot(a: Float64Array, i: number, b: Float64Array, j: number, n: number): number {
  let s = 0;
  for (let x = 0, oa = i * n, ob = j * n; x < n; x++) s += a[oa + x] * b[ob + x];
  return s;
}

/** M·C·Mᵀ for M (r × m, row-major) and C (m × m). */
function sandwich(mat: Float64Array, c: Float64Array, r: number, m: number): Float64Array {
  const out = new Float64Array(r * r);
  for (let a = 0; a < r; a++) for (let b = 0; b < r; b++) {
    let s = 0;
    for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) s += mat[a * m + p] * c[p * m + q] * mat[b * m + q];
    out[a * r + b] = s;
  }
  return out;
}
