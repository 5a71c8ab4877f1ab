import { type LayerAt } from '../optics';
import { evaluateLayers, type FitLayerData, type ParamLayout } from './layerModel';
import { type StackCovariance } from './stackUncertainty';

/**
 * The chip's layers fitted so far as random effects on one layer's model: columns Js·Ls (N each,
 * one per unit-normal weight), Js the model's sensitivity to each (index, thickness) of the last
 * `stack.size / 2` layers of `below` at the parameters p (forward differences, the steps of
 * fit/stackUncertainty), Ls the Cholesky factor of their covariance Σs, so that Js·δs with
 * δs ~ N(0, Σs) is Js·Ls·z with z ~ N(0, I) (the non-centred form of a Gaussian random effect).
 * Empty when the stack is empty or Σs is not positive semi-definite.
 */
export function stackBelowColumns(
  below: readonly LayerAt[], layer: FitLayerData, layout: ParamLayout, p: ArrayLike<number>, offsetSignal: number,
  at: Float64Array, stack: StackCovariance,
): Float64Array[] {
  const m = stack.size, k = m / 2, n = at.length;
  if (k < 1 || below.length < k) return [];
  const l = choleskyLower(stack.cov, m);
  if (!l) return [];
  const params = Float64Array.from(p);
  const js: Float64Array[] = [];
  const offset = below.length - k;
  for (let col = 0; col < m; col++) {
    const b = offset + (col >> 1), entry = below[b];
    const h = col % 2 === 0 ? 1e-5 : 1e-3;
    const moved = below.slice();
    moved[b] = col % 2 === 0 ? { ...entry, n: { re: entry.n.re + h, im: entry.n.im } } : { ...entry, thicknessNm: entry.thicknessNm + h };
    const shifted = new Float64Array(n);
    evaluateLayers(moved, [layer], layout, params, offsetSignal, shifted);
    js.push(differenceQuotient(shifted, at, h));
  }
  // (Js·Ls)_j = Σ_{i≥j} Js_i·L_ij
  return Array.from({ length: m }, (_, j) => {
    const c = new Float64Array(n);
    for (let i = j; i < m; i++) {
      const w = l[i * m + j];
      if (w !== 0) for (let t = 0; t < n; t++) c[t] += js[i][t] * w;
    }
    return c;
  });
}

/** Lower Cholesky factor of a symmetric positive semi-definite matrix (pivots below 1e-12 of the largest set to 0); null if indefinite. */
function choleskyLower(a: Float64Array, p: number): Float64Array | null {
  const l = new Float64Array(p * p);
  let big = 0;
  for (let i = 0; i < p; i++) big = Math.max(big, a[i * p + i]);
  if (!(big > 0)) return null;
  for (let j = 0; j < p; j++) {
    let s = a[j * p + j];
    for (let q = 0; q < j; q++) s -= l[j * p + q] ** 2;
    if (s < -1e-9 * big) return null;
    if (s <= 1e-12 * big) continue;
    const d = Math.sqrt(s);
    l[j * p + j] = d;
    for (let i = j + 1; i < p; i++) {
      let t = a[i * p + j];
      for (let q = 0; q < j; q++) t -= l[i * p + q] * l[j * p + q];
      l[i * p + j] = t / d;
    }
  }
  return l;
}

/**
 * The model's sensitivity to the thickness of the layer just below (the last of `below`), N
 * values: where that thickness holds a growth after its cut read from this layer's start
 * (fit/growthFromNext.ts), it was fitted to these very data, so the wander's choice frees it.
 */
export function lastBelowThicknessColumn(
  below: readonly LayerAt[], layer: FitLayerData, layout: ParamLayout, p: ArrayLike<number>, offsetSignal: number, at: Float64Array,
): Float64Array | null {
  if (below.length === 0) return null;
  const h = 1e-3, moved = below.slice(), last = below.length - 1;
  moved[last] = { ...below[last], thicknessNm: below[last].thicknessNm + h };
  const shifted = new Float64Array(at.length);
  evaluateLayers(moved, [layer], layout, Float64Array.from(p), offsetSignal, shifted);
  return differenceQuotient(shifted, at, h);
}

/** (shifted − at)/h at each row, in place of shifted; a plain loop (a typed array's from() calls its map function per row, about ten times the cost). */
function differenceQuotient(shifted: Float64Array, at: Float64Array, h: number): Float64Array {
  for (let i = 0; i < shifted.length; i++) shifted[i] = (shifted[i] - at[i]) / h;
  return shifted;
}
