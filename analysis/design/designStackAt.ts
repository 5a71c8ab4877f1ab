import { type Complex, scale } from '../optics/complex';
import { type LayerAt } from '../optics/assembly';
import { type StackAt } from '../optics/stackResponse';
import { indexAt } from '../materials/indexAt';
import { type MaterialModel } from '../materials/schema';
import { type Design } from './parseDesign';

/** An as-built layer: its thickness and, optionally, its index (fixed N, or the design dispersion scaled). */
export interface AsBuiltLayer {
  thicknessNm: number;
  /** Index used at every wavelength; overrides indexScale. */
  n?: Complex;
  /** Multiplies the design material's N(λ). @default 1 */
  indexScale?: number;
}

/**
 * The design's stack with every index evaluated at one wavelength. Without `asBuilt` all design
 * layers at design thickness; with it, asBuilt[i] replaces design layer i + 1 and the stack holds
 * asBuilt.length layers (a partly deposited run has fewer).
 * @throws RangeError when asBuilt has more layers than the design, or a material is out of range
 */
export function designStackAt(design: Design, wavelengthNm: number, asBuilt?: readonly AsBuiltLayer[]): StackAt {
  if (asBuilt && asBuilt.length > design.layers.length) {
    throw new RangeError(`asBuilt has ${asBuilt.length} layers, the design ${design.layers.length}`);
  }
  const cache = new Map<string, Complex>();
  const nOf = (material: string): Complex => {
    let n = cache.get(material);
    if (!n) {
      n = namedIndexAt(design.materials[material], wavelengthNm, `material "${material}"`);
      cache.set(material, n);
    }
    return n;
  };
  const count = asBuilt ? asBuilt.length : design.layers.length;
  const layers: LayerAt[] = new Array(count);
  for (let i = 0; i < count; i++) {
    const d = design.layers[i];
    const b = asBuilt?.[i];
    if (!b) {
      layers[i] = { n: nOf(d.material), thicknessNm: d.thicknessNm };
      continue;
    }
    const n = b.n ?? (b.indexScale === undefined || b.indexScale === 1 ? nOf(d.material) : scale(nOf(d.material), b.indexScale));
    layers[i] = { n, thicknessNm: b.thicknessNm };
  }
  return {
    ambient: namedIndexAt(design.ambient, wavelengthNm, 'ambient'),
    substrate: namedIndexAt(design.substrate, wavelengthNm, 'substrate'),
    layers,
  };
}

/** indexAt whose RangeError also says which of the design's materials failed. */
export function namedIndexAt(model: MaterialModel, wavelengthNm: number, what: string): Complex {
  try {
    return indexAt(model, wavelengthNm);
  } catch (e) {
    if (e instanceof RangeError) throw new RangeError(`${what}: ${e.message}`);
    throw e;
  }
}
