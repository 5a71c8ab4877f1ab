import { type Complex, div, mul, sqrt, sub } from './complex';

export type Polarization = 's' | 'p';

/**
 * Tilted quantities of a medium for light whose invariant is n0·sinθ0 (Snell).
 * `nCos` = N·cosθ sets the phase thickness; `eta` is the tilted optical admittance in units of
 * the free-space admittance: η_s = N·cosθ, η_p = N/cosθ = N²/(N·cosθ).
 * Macleod, Thin-Film Optical Filters, ch. 2: for absorbing media N·cosθ is taken in the fourth
 * quadrant (re ≥ 0, im ≤ 0), consistent with N = n − ik.
 */
export interface Tilted {
  nCos: Complex;
  eta: Complex;
}

export function tilt(n: Complex, n0SinTheta0: number, pol: Polarization): Tilted {
  const n2 = mul(n, n);
  let nCos = sqrt(sub(n2, { re: n0SinTheta0 * n0SinTheta0, im: 0 }));
  if (nCos.im > 0 || (nCos.im === 0 && nCos.re < 0)) nCos = { re: -nCos.re, im: -nCos.im };
  if (nCos.re < 0) nCos = { re: -nCos.re, im: -nCos.im };
  const eta = pol === 's' ? nCos : div(n2, nCos);
  return { nCos, eta };
}
