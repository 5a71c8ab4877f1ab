import { type Complex } from './complex';
import { type Mat2 } from './matrix';

/** Coherent amplitude response of an assembly seen from one side. */
export interface CoherentSide {
  /** Amplitude reflection coefficient r. */
  r: Complex;
  R: number;
  T: number;
  A: number;
}

export interface CoherentResponse {
  /** Light incident from the ambient. */
  front: CoherentSide;
  /** Light incident from the substrate (inside it) towards the ambient. */
  back: CoherentSide;
}

/**
 * From [B, C]ᵀ = M·[1, η_exit]ᵀ (Macleod, Thin-Film Optical Filters, eqs. 2.111–2.124):
 *   r = (η_in·B − C)/(η_in·B + C),  T = 4·Re(η_in)·Re(η_exit)/|η_in·B + C|²,
 *   A = 4·Re(η_in)·Re(B·C* − η_exit)/|η_in·B + C|².
 * The incident medium must be non-absorbing (real η_in).
 */
function side(
  m11r: number, m11i: number, m12r: number, m12i: number,
  m21r: number, m21i: number, m22r: number, m22i: number,
  etaIn: Complex, etaExit: Complex,
): CoherentSide {
  const br = m11r + m12r * etaExit.re - m12i * etaExit.im;
  const bi = m11i + m12r * etaExit.im + m12i * etaExit.re;
  const cr = m21r + m22r * etaExit.re - m22i * etaExit.im;
  const ci = m21i + m22r * etaExit.im + m22i * etaExit.re;
  const eBr = etaIn.re * br - etaIn.im * bi;
  const eBi = etaIn.re * bi + etaIn.im * br;
  const dr = eBr + cr;
  const di = eBi + ci;
  const nr = eBr - cr;
  const ni = eBi - ci;
  const den = dr * dr + di * di;
  const r = { re: (nr * dr + ni * di) / den, im: (ni * dr - nr * di) / den };
  const R = r.re * r.re + r.im * r.im;
  const T = (4 * etaIn.re * etaExit.re) / den;
  const bcStarRe = br * cr + bi * ci;
  const A = (4 * etaIn.re * (bcStarRe - etaExit.re)) / den;
  return { r, R, T, A };
}

/**
 * Both sides from one matrix: reversing a product of layer matrices (each with equal
 * diagonal elements) swaps the product's diagonal elements, so the view from the substrate
 * uses [[m22, m12], [m21, m11]].
 */
export function coherentResponse(m: Mat2, etaAmbient: Complex, etaSubstrate: Complex): CoherentResponse {
  return {
    front: side(m[0], m[1], m[2], m[3], m[4], m[5], m[6], m[7], etaAmbient, etaSubstrate),
    back: side(m[6], m[7], m[2], m[3], m[4], m[5], m[0], m[1], etaSubstrate, etaAmbient),
  };
}
