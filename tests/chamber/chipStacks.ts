import { type BandNode } from './band';
import { type ChamberDesign, dispersion } from './design';
import { identity, layerMatrix, mul, response, stackMatrices, type FilmLayer, type Mat, type Media } from './thinFilm';

/** A slab of a deposited layer: its material and its index deviation from the material's dispersion. */
export interface Sublayer {
  material: string;
  /** n − n_material(λ), taken as the same at every wavelength. */
  dn: number;
  thicknessNm: number;
}

/** What each witness chip carries so far, as sublayers (a graded film is a stack of slabs). */
export class ChipStacks {
  private readonly stacks = new Map<number, Sublayer[]>();
  constructor(private readonly design: ChamberDesign) {}

  media(wavelengthNm: number): Media {
    return {
      ambient: this.design.ambient ? dispersion(this.design.ambient, wavelengthNm).n : 1,
      substrate: dispersion(this.design.substrate, wavelengthNm).n,
      backside: this.design.substrateBackside,
    };
  }

  layersAt(chip: number, wavelengthNm: number): FilmLayer[] {
    return (this.stacks.get(chip) ?? []).map((s) => {
      const nk = dispersion(this.design.materials[s.material], wavelengthNm);
      return { n: nk.n + s.dn, k: nk.k, thicknessNm: s.thicknessNm };
    });
  }

  /** The whole chip stack's characteristic matrices at one wavelength (product over every slab). */
  matrices(chip: number, wavelengthNm: number): { forward: Mat; reverse: Mat } {
    return stackMatrices(this.layersAt(chip, wavelengthNm), wavelengthNm);
  }

  /** The chip's response as it stands (idle: nothing growing). */
  level(chip: number, wavelengthNm: number, mode: 'R' | 'T'): number {
    const m = this.matrices(chip, wavelengthNm);
    const r = response(m.forward, m.reverse, this.media(wavelengthNm));
    return mode === 'R' ? r.R : r.T;
  }

  /** The chip's response as the detector reads it over the monitor's band (the slit-weighted mean). */
  bandLevel(chip: number, band: readonly BandNode[], mode: 'R' | 'T'): number {
    if (band.length === 1) return this.level(chip, band[0].wavelengthNm, mode);
    let s = 0;
    for (const b of band) s += b.weight * this.level(chip, b.wavelengthNm, mode);
    return s;
  }

  add(chip: number, slabs: Sublayer[]): void {
    const list = this.stacks.get(chip) ?? [];
    list.push(...slabs);
    this.stacks.set(chip, list);
  }
}

/**
 * The response while one homogeneous layer of index n − ik grows to each thickness of `dNm`
 * on a stack given by its matrices: the whole product for every point.
 */
export function growingCurve(
  below: { forward: Mat; reverse: Mat }, media: Media, mode: 'R' | 'T', n: number, k: number, wavelengthNm: number, dNm: ArrayLike<number>,
): Float64Array {
  const out = new Float64Array(dNm.length);
  const m = new Float64Array(8), f = new Float64Array(8), r = new Float64Array(8);
  for (let i = 0; i < dNm.length; i++) {
    layerMatrix(n, k, dNm[i], wavelengthNm, m);
    mul(m, below.forward, f);
    mul(below.reverse, m, r);
    const x = response(f, r, media);
    out[i] = mode === 'R' ? x.R : x.T;
  }
  return out;
}

export { identity };
