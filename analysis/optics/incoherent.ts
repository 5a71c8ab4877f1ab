/**
 * A thick substrate whose two faces add in intensity, not amplitude (multiple incoherent
 * reflections; Macleod, Thin-Film Optical Filters, ch. 2, "incoherent reflection"):
 *   R = Ra + Ta²·τ²·Rb / (1 − Ra′·Rb·τ²),   T = Ta·Tb·τ / (1 − Ra′·Rb·τ²)
 * Ra, Ta: the coated face seen from the light's side; Ra′: that face seen from inside the
 * substrate; Rb, Tb: the far face seen from inside; τ: single-pass internal transmittance.
 */
export interface FaceIntensities {
  R: number;
  T: number;
  /** Reflectance of this face seen from inside the substrate. */
  RInside: number;
}

export function incoherentPair(near: FaceIntensities, far: FaceIntensities, internalT = 1): { R: number; T: number } {
  const t2 = internalT * internalT;
  const denom = 1 - near.RInside * far.RInside * t2;
  return {
    R: near.R + (near.T * near.T * t2 * far.RInside) / denom,
    T: (near.T * far.T * internalT) / denom,
  };
}
