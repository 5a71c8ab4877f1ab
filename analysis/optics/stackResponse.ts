import { arg, type Complex } from './complex';
import { assemblyMatrix, type LayerAt } from './assembly';
import { coherentResponse } from './coherent';
import { incoherentPair } from './incoherent';
import { identity } from './matrix';
import { tilt, type Polarization } from './tilt';

/** A stack with every index evaluated at one wavelength. Layers in deposition order. */
export interface StackAt {
  ambient: Complex;
  substrate: Complex;
  layers: readonly LayerAt[];
}

export interface ResponseOptions {
  /** Angle of incidence in the incident medium, degrees. @default 0 */
  angleDeg?: number;
  /** @default 'mean' */
  pol?: Polarization | 'mean';
  /** Side the light comes from. @default 'ambient' */
  incidence?: 'ambient' | 'substrate';
  /** Thick substrate with a bare back face added incoherently. @default false */
  backside?: boolean;
  /** Single-pass internal transmittance of a thick substrate. @default 1 */
  internalTransmittance?: number;
}

export interface StackResult {
  R: number;
  T: number;
  A: number;
  /** Phase of the coated face's amplitude reflection coefficient on the incident side, rad; NaN for the mean of s and p at oblique incidence. */
  phaseRad: number;
}

export function assertTransparentIncidence(n: Complex, what: string): void {
  if (!(n.re > 0) || n.im !== 0) {
    throw new RangeError(`${what} must be non-absorbing with n > 0 (got n = ${n.re}, k = ${-n.im})`);
  }
}

function onePolarization(stack: StackAt, wavelengthNm: number, pol: Polarization, o: Required<ResponseOptions>): StackResult {
  const fromSubstrateSide = o.incidence === 'substrate';
  const incidentIndex = fromSubstrateSide && !o.backside ? stack.substrate : stack.ambient;
  const invariant = incidentIndex.re * Math.sin((o.angleDeg * Math.PI) / 180);
  const eta0 = tilt(stack.ambient, invariant, pol).eta;
  const etaS = tilt(stack.substrate, invariant, pol).eta;
  const coated = coherentResponse(assemblyMatrix(stack.layers, wavelengthNm, invariant, pol), eta0, etaS);
  const face = fromSubstrateSide ? coated.back : coated.front;
  const phaseRad = arg(face.r);
  if (!o.backside) return { R: face.R, T: face.T, A: face.A, phaseRad };

  const bare = coherentResponse(identity(), eta0, etaS);
  const coatedFace = { R: coated.front.R, T: coated.front.T, RInside: coated.back.R };
  const bareFace = { R: bare.front.R, T: bare.front.T, RInside: bare.back.R };
  const pair = fromSubstrateSide
    ? incoherentPair(bareFace, coatedFace, o.internalTransmittance)
    : incoherentPair(coatedFace, bareFace, o.internalTransmittance);
  return { R: pair.R, T: pair.T, A: 1 - pair.R - pair.T, phaseRad };
}

/** R, T, A and reflection phase of a stack at one wavelength (characteristic-matrix method). */
export function stackResponse(stack: StackAt, wavelengthNm: number, options: ResponseOptions = {}): StackResult {
  const o: Required<ResponseOptions> = {
    angleDeg: options.angleDeg ?? 0,
    pol: options.pol ?? 'mean',
    incidence: options.incidence ?? 'ambient',
    backside: options.backside ?? false,
    internalTransmittance: options.internalTransmittance ?? 1,
  };
  if (!(wavelengthNm > 0)) throw new RangeError(`wavelength must be > 0 nm (got ${wavelengthNm})`);
  if (!(o.angleDeg >= 0 && o.angleDeg < 90)) throw new RangeError(`angle must be in [0, 90) degrees (got ${o.angleDeg})`);
  assertTransparentIncidence(stack.ambient, 'ambient');
  if (o.incidence === 'substrate' || o.backside) assertTransparentIncidence(stack.substrate, 'substrate');
  if (o.pol !== 'mean') return onePolarization(stack, wavelengthNm, o.pol, o);
  // At normal incidence η_p = N²/N = η_s: s and p coincide, one evaluation serves both.
  if (o.angleDeg === 0) return onePolarization(stack, wavelengthNm, 's', o);
  const s = onePolarization(stack, wavelengthNm, 's', o);
  const p = onePolarization(stack, wavelengthNm, 'p', o);
  return {
    R: (s.R + p.R) / 2,
    T: (s.T + p.T) / 2,
    A: (s.A + p.A) / 2,
    phaseRad: o.angleDeg === 0 ? s.phaseRad : Number.NaN,
  };
}
