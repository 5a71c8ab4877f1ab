import { designSpectrum } from './designSpectrum';
import { namedIndexAt } from './designStackAt';
import { type Design } from './parseDesign';
import { spectrumRange } from './spectrumRange';

/** Where the formulas come from, shown beside the numbers. */
export const SINGLE_LAYER_RULE_SOURCE =
  'H. A. Macleod, Thin-Film Optical Filters, chapter "Antireflection coatings" (the single quarter-wave layer); the same result in E. Hecht, Optics, section on thin-film interference.';

export interface QuarterWaveAr {
  /** √(n₀·n_s): the index a single quarter-wave layer needs for zero reflectance. */
  idealIndex: number;
  /** λ/(4n₁), nm. */
  quarterWaveNm: number;
  /** ((n₀n_s − n₁²)/(n₀n_s + n₁²))², fraction: the front-face reflectance of the quarter-wave layer at λ. */
  residualR: number;
  /** (n₀ − n_s)²/(n₀ + n_s)², fraction: the bare front face. */
  bareR: number;
}

/**
 * The single quarter-wave antireflection layer at normal incidence, non-absorbing media
 * (Macleod, Thin-Film Optical Filters, ch. "Antireflection coatings").
 */
export function quarterWaveAr(n0: number, ns: number, n1: number, wavelengthNm: number): QuarterWaveAr {
  for (const [what, v] of [['n0', n0], ['ns', ns], ['n1', n1], ['wavelengthNm', wavelengthNm]] as const) {
    if (!(Number.isFinite(v) && v > 0)) throw new RangeError(`${what} must be a finite number > 0 (got ${v})`);
  }
  const y = n0 * ns;
  const n12 = n1 * n1;
  return {
    idealIndex: Math.sqrt(y),
    quarterWaveNm: wavelengthNm / (4 * n1),
    residualR: ((y - n12) / (y + n12)) ** 2,
    bareR: ((n0 - ns) / (n0 + ns)) ** 2,
  };
}

export interface SingleLayerRule extends QuarterWaveAr {
  wavelengthNm: number;
  ambientIndex: number;
  substrateIndex: number;
  /** The lowest-index material the design's layers use, and its n at λref. */
  lowMaterial: string;
  lowIndex: number;
  /** What the design itself reaches (front face only, normal incidence, like the rule). */
  designRAtRef: number;
  band: { fromNm: number; toNm: number; meanR: number; maxR: number };
}

/** Band over which the design's own R is summarised when the file names none: 0.8·λref to 1.25·λref (common practice for a visible AR about its centre). */
export function defaultBand(referenceWavelengthNm: number): { fromNm: number; toNm: number } {
  return { fromNm: Math.round(0.8 * referenceWavelengthNm), toNm: Math.round(1.25 * referenceWavelengthNm) };
}

/**
 * The single-layer rule with a design's own numbers: its ambient, substrate and lowest-index
 * layer material at the reference wavelength, beside the design's front-face reflectance there
 * and across a band. Null when the design has no layers.
 */
export function singleLayerRule(design: Design, band = defaultBand(design.referenceWavelengthNm)): SingleLayerRule | null {
  if (design.layers.length === 0) return null;
  const wl = design.referenceWavelengthNm;
  const n0 = namedIndexAt(design.ambient, wl, 'ambient').re;
  const ns = namedIndexAt(design.substrate, wl, 'substrate').re;
  let lowMaterial = '';
  let lowIndex = Infinity;
  for (const name of new Set(design.layers.map((l) => l.material))) {
    const n = namedIndexAt(design.materials[name], wl, `material "${name}"`).re;
    if (n < lowIndex) {
      lowIndex = n;
      lowMaterial = name;
    }
  }
  const front: Design = { ...design, substrateBackside: false };
  const atRef = designSpectrum(front, { fromNm: wl, toNm: wl, stepNm: 1 }).R[0];
  const step = Math.max(1, (band.toNm - band.fromNm) / 400);
  // The band narrowed to where every material has an index (a measured table may cover less);
  // where no wavelength of it has, the reference wavelength alone (its own error if it fails too).
  const shown = spectrumRange(front, { ...band, stepNm: step }) ?? { fromNm: wl, toNm: wl, stepNm: 1 };
  const R = designSpectrum(front, shown).R;
  let sum = 0;
  let max = 0;
  for (const r of R) {
    sum += r;
    max = Math.max(max, r);
  }
  return {
    ...quarterWaveAr(n0, ns, lowIndex, wl),
    wavelengthNm: wl,
    ambientIndex: n0,
    substrateIndex: ns,
    lowMaterial,
    lowIndex,
    designRAtRef: atRef,
    band: { fromNm: shown.fromNm, toNm: shown.toNm, meanR: sum / R.length, maxR: max },
  };
}
