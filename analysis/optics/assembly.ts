import { type Complex } from './complex';
import { gradedSublayers } from './gradedSublayers';
import { layerMatrix, type Mat2, multiply } from './matrix';
import { tilt, type Polarization, type Tilted } from './tilt';

/** One layer with its complex index at the wavelength in question. */
export interface LayerAt {
  /** The index; with indexChange, its mean through the thickness. */
  n: Complex;
  thicknessNm: number;
  /** A linear index gradient: the real index rises by this much from the layer's bottom to its top (optics/gradedLayer.ts). @default 0 */
  indexChange?: number;
}

/**
 * The characteristic matrix of an assembly, M = M_top · … · M_1, for layers listed in
 * deposition order (layers[0] touches the substrate, the last faces the ambient). Written into
 * `out` (a new matrix by default).
 */
export function assemblyMatrix(
  layers: readonly LayerAt[],
  wavelengthNm: number,
  n0SinTheta0: number,
  pol: Polarization,
  out: Mat2 = new Float64Array(8),
): Mat2 {
  let m: Mat2 = out.fill(0);
  m[0] = 1;
  m[6] = 1;
  let tmp: Mat2 = PRODUCT;
  const lm = LAYER;
  // Stacks alternate a few materials whose index objects are shared: tilt each distinct one once.
  let lastA: Complex | null = null, tiltA: Tilted | null = null;
  let lastB: Complex | null = null, tiltB: Tilted | null = null;
  for (let j = layers.length - 1; j >= 0; j--) {
    const layer = layers[j];
    if (layer.indexChange) {
      // a graded layer: its homogeneous sublayers, top first
      const subs = gradedSublayers({ re: layer.n.re - layer.indexChange / 2, im: layer.n.im }, layer.indexChange, layer.thicknessNm);
      for (let s = subs.length - 1; s >= 0; s--) {
        const ts = tilt(subs[s].n, n0SinTheta0, pol);
        layerMatrix(lm, ts.nCos, ts.eta, subs[s].thicknessNm, wavelengthNm);
        multiply(tmp, m, lm);
        [m, tmp] = [tmp, m];
      }
      continue;
    }
    let t: Tilted;
    if (layer.n === lastA) t = tiltA!;
    else if (layer.n === lastB) t = tiltB!;
    else {
      t = tilt(layer.n, n0SinTheta0, pol);
      lastB = lastA;
      tiltB = tiltA;
      lastA = layer.n;
      tiltA = t;
    }
    const { nCos, eta } = t;
    layerMatrix(lm, nCos, eta, layer.thicknessNm, wavelengthNm);
    // m accumulates from the ambient side downwards: m ← m · M_j
    multiply(tmp, m, lm);
    [m, tmp] = [tmp, m];
  }
  if (m !== out) out.set(m);
  return out;
}

/**
 * assemblyMatrix's working matrices (the product's other half and one layer's), kept between its
 * calls: it is not re-entered, and a module has one copy a thread. A monitor signal's set-up
 * assembles the stack below once per evaluation (tens of thousands a run), and three new arrays
 * each time were a good part of what the fits left to the collector.
 */
const PRODUCT: Mat2 = new Float64Array(8), LAYER: Mat2 = new Float64Array(8);
