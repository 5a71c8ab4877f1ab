import { type Complex, div } from './complex';

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

/**
 * N·cosθ = √(N² − (n0·sinθ0)²) with complex.ts's mul, sub and sqrt written out on plain numbers,
 * operation for operation (the same figures): tilt runs for every medium of every monitor signal
 * evaluated (tens of thousands a run), and each of those helpers made an object, so a call left
 * about six on the heap; now it makes N·cosθ and its result (and N² for p).
 */
export function tilt(n: Complex, n0SinTheta0: number, pol: Polarization): Tilted {
  // N² (mul)
  const n2r = n.re * n.re - n.im * n.im, n2i = n.re * n.im + n.im * n.re;
  // N² − (n0·sinθ0)² (sub)
  const ar = n2r - n0SinTheta0 * n0SinTheta0, ai = n2i - 0;
  // its principal square root (sqrt: the half-angle form, see there)
  let re: number, im: number;
  const m = Math.hypot(ar, ai);
  if (m === 0) {
    re = 0;
    im = 0;
  } else if (ar >= 0) {
    re = Math.sqrt((m + ar) / 2);
    im = ai / (2 * re);
  } else {
    const t = Math.sqrt((m - ar) / 2);
    re = Math.abs(ai) / (2 * t);
    im = ai < 0 ? -t : t;
  }
  if (im > 0 || (im === 0 && re < 0)) {
    re = -re;
    im = -im;
  }
  if (re < 0) {
    re = -re;
    im = -im;
  }
  const nCos = { re, im };
  const eta = pol === 's' ? nCos : div({ re: n2r, im: n2i }, nCos);
  return { nCos, eta };
}
