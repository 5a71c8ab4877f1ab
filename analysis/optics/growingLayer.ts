import { type Complex } from './complex';
import { assemblyMatrix, type LayerAt } from './assembly';
import { assertTransparentIncidence } from './stackResponse';
import { tilt, type Polarization } from './tilt';

/** A layer growing on a witness chip whose earlier layers are already deposited. */
export interface GrowingLayer {
  ambient: Complex;
  substrate: Complex;
  /** Layers already on the chip, deposition order. */
  below: readonly LayerAt[];
  /** Index of the growing layer at the monitor wavelength. */
  growing: Complex;
  wavelengthNm: number;
  mode: 'R' | 'T';
  /** @default false */
  backside?: boolean;
  /** @default 0 */
  angleDeg?: number;
  /** @default 'mean' */
  pol?: Polarization | 'mean';
}

/**
 * The monitor signal (R or T as a fraction) against the growing layer's physical thickness.
 * The stack below is folded into one matrix once; each thickness point then costs one layer
 * matrix and one 2×2 product, with no allocation.
 */
export function growingLayerSignal(
  spec: GrowingLayer,
  thicknessNm: ArrayLike<number>,
  out: Float64Array = new Float64Array(thicknessNm.length),
): Float64Array {
  assertTransparentIncidence(spec.ambient, 'ambient');
  if (spec.backside) assertTransparentIncidence(spec.substrate, 'substrate');
  const pol = spec.pol ?? 'mean';
  if (pol !== 'mean') {
    accumulate(spec, pol, thicknessNm, out, 1, true);
    return out;
  }
  accumulate(spec, 's', thicknessNm, out, 0.5, true);
  accumulate(spec, 'p', thicknessNm, out, 0.5, false);
  return out;
}

function accumulate(
  spec: GrowingLayer,
  pol: Polarization,
  thicknessNm: ArrayLike<number>,
  out: Float64Array,
  weight: number,
  overwrite: boolean,
): void {
  const invariant = spec.ambient.re * Math.sin(((spec.angleDeg ?? 0) * Math.PI) / 180);
  const e0 = tilt(spec.ambient, invariant, pol).eta;
  const es = tilt(spec.substrate, invariant, pol).eta;
  const g = tilt(spec.growing, invariant, pol);
  const mb = assemblyMatrix(spec.below, spec.wavelengthNm, invariant, pol);
  const [b11r, b11i, b12r, b12i, b21r, b21i, b22r, b22i] = mb;
  const k = (2 * Math.PI) / spec.wavelengthNm;
  const etaDen = g.eta.re * g.eta.re + g.eta.im * g.eta.im;
  const wantR = spec.mode === 'R';
  const backside = spec.backside ?? false;
  // Bare back face seen from inside the substrate (Fresnel), for the incoherent sum.
  const rbNum = { re: es.re - e0.re, im: es.im - e0.im };
  const rbDen = { re: es.re + e0.re, im: es.im + e0.im };
  const rBack = (rbNum.re * rbNum.re + rbNum.im * rbNum.im) / (rbDen.re * rbDen.re + rbDen.im * rbDen.im);
  const tBack = 1 - rBack;

  for (let i = 0; i < thicknessNm.length; i++) {
    const dr = g.nCos.re * k * thicknessNm[i];
    const di = g.nCos.im * k * thicknessNm[i];
    const ch = Math.cosh(di), sh = Math.sinh(di), cd = Math.cos(dr), sd = Math.sin(dr);
    const cr = cd * ch, ci = -sd * sh;
    const isr = -cd * sh, isi = sd * ch;
    const l12r = (isr * g.eta.re + isi * g.eta.im) / etaDen;
    const l12i = (isi * g.eta.re - isr * g.eta.im) / etaDen;
    const l21r = isr * g.eta.re - isi * g.eta.im;
    const l21i = isr * g.eta.im + isi * g.eta.re;
    // M = L · Mb
    const m11r = cr * b11r - ci * b11i + l12r * b21r - l12i * b21i;
    const m11i = cr * b11i + ci * b11r + l12r * b21i + l12i * b21r;
    const m12r = cr * b12r - ci * b12i + l12r * b22r - l12i * b22i;
    const m12i = cr * b12i + ci * b12r + l12r * b22i + l12i * b22r;
    const m21r = l21r * b11r - l21i * b11i + cr * b21r - ci * b21i;
    const m21i = l21r * b11i + l21i * b11r + cr * b21i + ci * b21r;
    const m22r = l21r * b12r - l21i * b12i + cr * b22r - ci * b22i;
    const m22i = l21r * b12i + l21i * b12r + cr * b22i + ci * b22r;
    // Front: B = m11 + m12·ηs, C = m21 + m22·ηs (Macleod eq. 2.111)
    const Br = m11r + m12r * es.re - m12i * es.im, Bi = m11i + m12r * es.im + m12i * es.re;
    const Cr = m21r + m22r * es.re - m22i * es.im, Ci = m21i + m22r * es.im + m22i * es.re;
    const sumR = e0.re * Br - e0.im * Bi + Cr, sumI = e0.re * Bi + e0.im * Br + Ci;
    const den = sumR * sumR + sumI * sumI;
    const difR = e0.re * Br - e0.im * Bi - Cr, difI = e0.re * Bi + e0.im * Br - Ci;
    const Rf = (difR * difR + difI * difI) / den;
    const Tf = (4 * e0.re * es.re) / den;
    let value: number;
    if (!backside) {
      value = wantR ? Rf : Tf;
    } else {
      // Coated face seen from inside: reversed matrix [[m22, m12], [m21, m11]] (see coherent.ts)
      const B2r = m22r + m12r * e0.re - m12i * e0.im, B2i = m22i + m12r * e0.im + m12i * e0.re;
      const C2r = m21r + m11r * e0.re - m11i * e0.im, C2i = m21i + m11r * e0.im + m11i * e0.re;
      const s2r = es.re * B2r - es.im * B2i + C2r, s2i = es.re * B2i + es.im * B2r + C2i;
      const d2r = es.re * B2r - es.im * B2i - C2r, d2i = es.re * B2i + es.im * B2r - C2i;
      const Rin = (d2r * d2r + d2i * d2i) / (s2r * s2r + s2i * s2i);
      const denom = 1 - Rin * rBack;
      value = wantR ? Rf + (Tf * Tf * rBack) / denom : (Tf * tBack) / denom;
    }
    out[i] = overwrite ? weight * value : out[i] + weight * value;
  }
}
