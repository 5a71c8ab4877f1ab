import { fringeSpectrum, type Disturbance } from '../trace';

export interface LayerSpectrum {
  /** The layer's dominant fringe frequency; null when it holds under about 1.5 fringes. */
  fringeFrequencyHz: number | null;
  /** Rate implied by the fringe frequency, nm/s; null with the frequency. */
  fringeRateNmPerS: number | null;
  /** Narrow periodic peaks well above the fringe frequency (holder rotation, mains aliases). */
  disturbances: Disturbance[];
}

/** No fringe, no disturbance: a layer too short to tell, or one whose spectrum is not read. */
export const NO_SPECTRUM: LayerSpectrum = { fringeFrequencyHz: null, fringeRateNmPerS: null, disturbances: [] };

/**
 * The spectrum of one layer's samples. The monitor signal of a growing transparent layer repeats
 * every half-wave of optical thickness — the layer's characteristic matrix changes sign when its
 * phase thickness δ grows by π (Macleod, Thin-Film Optical Filters, ch. 2) — so one fringe is
 * λ/(2n) of physical thickness and the rate is about f·λ/(2n). A drifting rate smears the peak;
 * the figure is a first guess, refined by the fit.
 */
export function layerSpectrum(tauS: ArrayLike<number>, y: ArrayLike<number>, wavelengthNm: number, index: number): LayerSpectrum {
  if (tauS.length < 32) return NO_SPECTRUM;
  // No zero padding at half the default length: the same band and resolution, half the cost.
  const s = fringeSpectrum(tauS, y, { maxFftSize: 4096, padFactor: 1 });
  // A true fringe carries most of the layer's swing; a small peak is noise or a harmonic of a
  // part-fringe layer, and no basis for a rate.
  const top = s.peaks[0];
  const strong = top !== undefined && top.amplitude >= 0.3 * ((highest(y) - lowest) / 2);
  const f = strong && Number.isFinite(s.dominantFrequencyHz) && s.dominantFrequencyHz > 0 ? s.dominantFrequencyHz : null;
  return {
    fringeFrequencyHz: f,
    fringeRateNmPerS: f === null ? null : (f * wavelengthNm) / (2 * index),
    disturbances: s.disturbances,
  };
}

/**
 * Largest value of y, its smallest to `lowest` (a function of its own, so the engine optimises
 * this loop apart from the rest). Nothing but a return after the loop: the engine compiled the
 * loop on the stack during the first call, and code with an operation after the loop, never
 * reached then, left at it on every later call (about 40 times a run).
 */
function highest(y: ArrayLike<number>): number {
  let lo = Infinity, hi = -Infinity;
  const n = y.length;
  for (let i = 0; i < n; i++) {
    const v = y[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  lowest = lo;
  return hi;
}

/** highest's second result. */
let lowest = Infinity;
