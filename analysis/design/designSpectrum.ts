import { stackResponse } from '../optics/stackResponse';
import { type Polarization } from '../optics/tilt';
import { type AsBuiltLayer, designStackAt } from './designStackAt';
import { type Design } from './parseDesign';

export interface SpectrumOptions {
  /** @default 400 */
  fromNm?: number;
  /** @default 800 */
  toNm?: number;
  /** @default 1 */
  stepNm?: number;
  /** Angle of incidence in the ambient, degrees. @default 0 */
  angleDeg?: number;
  /** @default 'mean' */
  pol?: Polarization | 'mean';
}

export interface Spectrum {
  wavelengthNm: Float64Array;
  R: Float64Array;
  T: Float64Array;
}

/** Upper bound on spectrum points, so a typo in --step cannot ask for gigabytes. */
export const MAX_SPECTRUM_POINTS = 1_000_000;

/** The wavelength grid from, from + step, …, up to `to` inclusive (to within 1e-9 of a step). */
export function wavelengthGrid(fromNm: number, toNm: number, stepNm: number): Float64Array {
  if (![fromNm, toNm, stepNm].every(Number.isFinite)) throw new RangeError('from, to and step must be finite numbers');
  if (!(fromNm > 0)) throw new RangeError(`from must be > 0 nm (got ${fromNm})`);
  if (!(toNm >= fromNm)) throw new RangeError(`to (${toNm} nm) must not be below from (${fromNm} nm)`);
  if (!(stepNm > 0)) throw new RangeError(`step must be > 0 nm (got ${stepNm})`);
  const count = Math.floor((toNm - fromNm) / stepNm + 1e-9) + 1;
  if (count > MAX_SPECTRUM_POINTS) throw new RangeError(`${count} wavelengths requested; at most ${MAX_SPECTRUM_POINTS}`);
  const grid = new Float64Array(count);
  // Rounded to 1e-9 nm so 400 + 3·0.1 prints as 400.3.
  for (let i = 0; i < count; i++) grid[i] = Math.round((fromNm + i * stepNm) * 1e9) / 1e9;
  return grid;
}

/**
 * R and T (fractions) of an as-built stack on the design's substrate, with the design's backside
 * treatment; `asBuilt` as in designStackAt (undefined: the design itself).
 */
export function spectrumOfStack(design: Design, asBuilt: readonly AsBuiltLayer[] | undefined, options: SpectrumOptions = {}): Spectrum {
  const wavelengthNm = wavelengthGrid(options.fromNm ?? 400, options.toNm ?? 800, options.stepNm ?? 1);
  const response = { angleDeg: options.angleDeg ?? 0, pol: options.pol ?? 'mean', backside: design.substrateBackside } as const;
  const R = new Float64Array(wavelengthNm.length);
  const T = new Float64Array(wavelengthNm.length);
  for (let i = 0; i < wavelengthNm.length; i++) {
    const r = stackResponse(designStackAt(design, wavelengthNm[i], asBuilt), wavelengthNm[i], response);
    R[i] = r.R;
    T[i] = r.T;
  }
  return { wavelengthNm, R, T };
}

/** The design's spectrum as specified (shared/FORMATS.md `spectrum`). */
export function designSpectrum(design: Design, options: SpectrumOptions = {}): Spectrum {
  return spectrumOfStack(design, undefined, options);
}
