import { assemblyMatrix } from './assembly';
import { coherentResponse } from './coherent';
import { type GrowingLayer } from './growingLayer';
import { incoherentPair } from './incoherent';
import { identity, layerMatrix, multiply, type Mat2 } from './matrix';
import { GRADED_SLAB_NM } from './gradedSublayers';
import { assertTransparentIncidence } from './stackResponse';
import { tilt, type Polarization } from './tilt';

/**
 * The monitor signal against the physical thickness of a growing layer whose index rises by
 * perNm per nm above its bottom, n(z) = growing.re + perNm·z (spec.growing is the index at
 * z = 0). The sublayer product is carried from one thickness to the next (the points visited
 * in increasing thickness), one slab of at most GRADED_SLAB_NM at a time, so a point costs one
 * slab matrix per 2 nm it lies above the last (at least one). A thickness ≤ 0 uses the bottom index as a homogeneous layer.
 */
export function gradedGrowingSignal(
  spec: GrowingLayer,
  perNm: number,
  thicknessNm: ArrayLike<number>,
  out: Float64Array = new Float64Array(thicknessNm.length),
): Float64Array {
  assertTransparentIncidence(spec.ambient, 'ambient');
  if (spec.backside) assertTransparentIncidence(spec.substrate, 'substrate');
  const pol = spec.pol ?? 'mean';
  const order = increasing(thicknessNm);
  if (pol !== 'mean' || (spec.angleDeg ?? 0) === 0) {
    accumulate(spec, pol === 'mean' ? 's' : pol, perNm, thicknessNm, order, out, 1, true);
    return out;
  }
  // two passes: the thicknesses must outlive the first when written over
  const d = (thicknessNm as unknown) === out ? Float64Array.from(thicknessNm) : thicknessNm;
  accumulate(spec, 's', perNm, d, order, out, 0.5, true);
  accumulate(spec, 'p', perNm, d, order, out, 0.5, false);
  return out;
}

/** Indices of the points in increasing thickness (the identity when already so, the usual case). */
function increasing(d: ArrayLike<number>): Int32Array {
  const order = Int32Array.from({ length: d.length }, (_, i) => i);
  for (let i = 1; i < d.length; i++) {
    if (d[i] < d[i - 1]) return order.sort((a, b) => d[a] - d[b]);
  }
  return order;
}

function accumulate(
  spec: GrowingLayer, pol: Polarization, perNm: number, thicknessNm: ArrayLike<number>, order: Int32Array,
  out: Float64Array, weight: number, overwrite: boolean,
): void {
  const invariant = spec.ambient.re * Math.sin(((spec.angleDeg ?? 0) * Math.PI) / 180);
  const e0 = tilt(spec.ambient, invariant, pol).eta;
  const es = tilt(spec.substrate, invariant, pol).eta;
  const mb = assemblyMatrix(spec.below, spec.wavelengthNm, invariant, pol);
  const wl = spec.wavelengthNm;
  const bare = coherentResponse(identity(), e0, es);
  const bareFace = { R: bare.front.R, T: bare.front.T, RInside: bare.back.R };
  const wantR = spec.mode === 'R';
  const g: Mat2 = identity(), s = new Float64Array(8), tmp = new Float64Array(8), m = new Float64Array(8);
  let z = 0;
  const slab = (zFrom: number, h: number, into: Mat2) => {
    const t = tilt({ re: spec.growing.re + perNm * (zFrom + h / 2), im: spec.growing.im }, invariant, pol);
    return layerMatrix(into, t.nCos, t.eta, h, wl);
  };
  for (const i of order) {
    const d = thicknessNm[i];
    let graded: Mat2;
    if (d <= 0) graded = slab(0, d, tmp.fill(0));
    else {
      // G(z + h) = S(z, h)·G(z): the newest slab faces the ambient.
      while (z < d) {
        const h = Math.min(GRADED_SLAB_NM, d - z);
        slab(z, h, s);
        multiply(tmp, s, g);
        g.set(tmp);
        z += h;
      }
      graded = g;
    }
    multiply(m, graded, mb);
    const c = coherentResponse(m, e0, es);
    let value: number;
    if (!spec.backside) value = wantR ? c.front.R : c.front.T;
    else {
      const pair = incoherentPair({ R: c.front.R, T: c.front.T, RInside: c.back.R }, bareFace);
      value = wantR ? pair.R : pair.T;
    }
    out[i] = overwrite ? weight * value : out[i] + weight * value;
  }
}
