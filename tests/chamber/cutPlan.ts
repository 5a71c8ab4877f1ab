import { growingCurve } from './chipStacks';
import { type Mat, type Media } from './thinFilm';

const STEPS = 3000;

interface CurveInput {
  below: { forward: Mat; reverse: Mat };
  media: Media;
  mode: 'R' | 'T';
  n: number;
  k: number;
  wavelengthNm: number;
  /** The monitor's band (option bandwidthNm): the curve is the weighted sum over these in place of the one wavelength above. */
  band?: (Omit<CurveInput, 'mode' | 'band'> & { weight: number })[];
}

/** The curve the detector reads while the layer grows: at the one wavelength, or averaged over the band. */
function curve(c: CurveInput, dNm: ArrayLike<number>): Float64Array {
  if (!c.band) return growingCurve(c.below, c.media, c.mode, c.n, c.k, c.wavelengthNm, dNm);
  const out = new Float64Array(dNm.length);
  for (const b of c.band) {
    const s = growingCurve(b.below, b.media, c.mode, b.n, b.k, b.wavelengthNm, dNm);
    for (let i = 0; i < out.length; i++) out[i] += b.weight * s[i];
  }
  return out;
}

function grid(dMax: number): Float64Array {
  return Float64Array.from({ length: STEPS + 1 }, (_, i) => (i * dMax) / STEPS);
}

/**
 * Turning-point cut: the thickness of the true curve's extremum nearest the design thickness
 * (the controller cuts on the turning point it sees, not on the design's; with a band, on the
 * band-averaged curve the detector reads).
 */
export function turningPointThickness(truth: CurveInput, designNm: number): number {
  const d = grid(1.6 * designNm);
  const s = curve(truth, d);
  let best = designNm, bestGap = Infinity;
  for (let i = 1; i < STEPS; i++) {
    // a sign change of the slope; equal neighbours on either side of a differing point are an
    // extremum that falls exactly on the grid (a symmetric curve), not a flat stretch
    const extremum = (s[i] - s[i - 1]) * (s[i + 1] - s[i]) <= 0 && !(s[i] === s[i - 1] && s[i] === s[i + 1]);
    if (!extremum) continue;
    // refine by the parabola through three points
    const den = s[i - 1] - 2 * s[i] + s[i + 1];
    const at = d[i] + (den === 0 ? 0 : (0.5 * (s[i - 1] - s[i + 1]) * (d[1] - d[0])) / den);
    if (Math.abs(at - designNm) < bestGap) {
      bestGap = Math.abs(at - designNm);
      best = at;
    }
  }
  return best;
}

/**
 * Level cut: the trigger is the design's modelled signal at the design thickness (nominal stack
 * below); the true curve reaches it on the branch of the same slope nearest the design thickness.
 * With a band the controller's model stays at the one wavelength (as the analysis's does) while
 * the true curve is the band-averaged reading.
 */
export function levelCutThickness(design: CurveInput, truth: CurveInput, designNm: number): { thicknessNm: number; triggerLevel: number } {
  const eps = designNm * 1e-4;
  const [lo, at, hi] = curve(design, [designNm - eps, designNm, designNm + eps]);
  const slope = Math.sign(hi - lo);
  const d = grid(1.6 * designNm);
  const s = curve(truth, d);
  let best = designNm, bestGap = Infinity;
  for (let i = 1; i <= STEPS; i++) {
    const a = s[i - 1] - at, b = s[i] - at;
    if (a * b > 0 || a === b || Math.sign(s[i] - s[i - 1]) !== slope) continue;
    const x = d[i - 1] + ((d[i] - d[i - 1]) * a) / (a - b);
    if (Math.abs(x - designNm) < bestGap) {
      bestGap = Math.abs(x - designNm);
      best = x;
    }
  }
  return { thicknessNm: best, triggerLevel: at };
}
