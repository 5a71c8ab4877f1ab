import { type Complex } from './complex';

/**
 * A 2×2 complex matrix stored flat as [m11re, m11im, m12re, m12im, m21re, m21im, m22re, m22im].
 * Flat storage keeps the inner loops of spectra and monitor curves allocation-free.
 */
export type Mat2 = Float64Array;

export function identity(): Mat2 {
  const m = new Float64Array(8);
  m[0] = 1;
  m[6] = 1;
  return m;
}

/**
 * Characteristic matrix of one layer (Macleod, Thin-Film Optical Filters, eq. 2.106):
 *   [ cos δ        i sin δ / η ]
 *   [ i η sin δ    cos δ       ]
 * with δ = 2π·N·cosθ·d/λ. Written into `out`.
 */
export function layerMatrix(out: Mat2, nCos: Complex, eta: Complex, thicknessNm: number, wavelengthNm: number): Mat2 {
  const k = (2 * Math.PI * thicknessNm) / wavelengthNm;
  const dr = nCos.re * k;
  const di = nCos.im * k;
  const ch = Math.cosh(di);
  const sh = Math.sinh(di);
  const cr = Math.cos(dr) * ch;
  const ci = -Math.sin(dr) * sh;
  const sr = Math.sin(dr) * ch;
  const si = Math.cos(dr) * sh;
  // i·sinδ = (−si) + i·sr
  const isr = -si;
  const isi = sr;
  // (i sinδ)/η
  const den = eta.re * eta.re + eta.im * eta.im;
  out[0] = cr;
  out[1] = ci;
  out[2] = (isr * eta.re + isi * eta.im) / den;
  out[3] = (isi * eta.re - isr * eta.im) / den;
  out[4] = isr * eta.re - isi * eta.im;
  out[5] = isr * eta.im + isi * eta.re;
  out[6] = cr;
  out[7] = ci;
  return out;
}

/** out = a · b (out may alias neither a nor b). */
export function multiply(out: Mat2, a: Mat2, b: Mat2): Mat2 {
  for (let row = 0; row < 2; row++) {
    for (let col = 0; col < 2; col++) {
      const a1r = a[row * 4], a1i = a[row * 4 + 1], a2r = a[row * 4 + 2], a2i = a[row * 4 + 3];
      const b1r = b[col * 2], b1i = b[col * 2 + 1], b2r = b[4 + col * 2], b2i = b[4 + col * 2 + 1];
      out[row * 4 + col * 2] = a1r * b1r - a1i * b1i + a2r * b2r - a2i * b2i;
      out[row * 4 + col * 2 + 1] = a1r * b1i + a1i * b1r + a2r * b2i + a2i * b2r;
    }
  }
  return out;
}

export const element = (m: Mat2, row: 0 | 1, col: 0 | 1): Complex => ({
  re: m[row * 4 + col * 2],
  im: m[row * 4 + col * 2 + 1],
});
