/**
 * The simulator's own reading of a fringelog.design/1 design (shared/FORMATS.md), with every
 * material given as a model (built-in library names are resolved by whoever calls it: the
 * simulator keeps no copy of the library). Structurally, a parsed design satisfies it too.
 */
export type ChamberMaterial =
  | { model: 'constant'; n: number; k?: number }
  | { model: 'cauchy'; A: number; B: number; C?: number; k?: number }
  | { model: 'sellmeier'; B: number[]; C: number[] }
  | { model: 'table'; points: [number, number, number][] };

export interface ChamberLayer {
  material: string;
  /** Physical thickness; when absent, from `qwot` at the reference wavelength. */
  thicknessNm?: number;
  qwot?: number;
  monitor: { wavelengthNm: number; mode: 'R' | 'T'; chip: number; cut: 'turning-point' | 'level' };
}

export interface ChamberDesign {
  name?: string;
  referenceWavelengthNm: number;
  ambient?: ChamberMaterial;
  substrate: ChamberMaterial;
  substrateBackside: boolean;
  materials: Record<string, ChamberMaterial>;
  layers: ChamberLayer[];
}

/** Real and imaginary parts of N = n − ik (FORMATS sign convention; k ≥ 0 absorbs). */
export interface NK {
  n: number;
  k: number;
}

/**
 * A FORMATS material model at one wavelength. Cauchy n = A + B/λ² + C/λ⁴ and Sellmeier
 * n² = 1 + Σ Bᵢλ²/(λ² − Cᵢ²) with λ in µm (as in shared/FORMATS.md; Sellmeier after
 * I. H. Malitson, J. Opt. Soc. Am. 55, 1205 (1965)); tables interpolate linearly.
 */
export function dispersion(m: ChamberMaterial, wavelengthNm: number): NK {
  const um = wavelengthNm / 1000;
  const l2 = um * um;
  switch (m.model) {
    case 'constant':
      return { n: m.n, k: m.k ?? 0 };
    case 'cauchy':
      return { n: m.A + m.B / l2 + (m.C ?? 0) / (l2 * l2), k: m.k ?? 0 };
    case 'sellmeier': {
      let n2 = 1;
      m.B.forEach((b, i) => (n2 += (b * l2) / (l2 - m.C[i] * m.C[i])));
      if (!(n2 > 0)) throw new RangeError(`chamber simulator: Sellmeier n² = ${n2} at ${wavelengthNm} nm`);
      return { n: Math.sqrt(n2), k: 0 };
    }
    case 'table': {
      const p = m.points;
      if (wavelengthNm < p[0][0] || wavelengthNm > p[p.length - 1][0]) {
        throw new RangeError(`chamber simulator: ${wavelengthNm} nm outside the table (${p[0][0]}–${p[p.length - 1][0]} nm)`);
      }
      let i = 0;
      while (i < p.length - 2 && p[i + 1][0] < wavelengthNm) i++;
      const f = (wavelengthNm - p[i][0]) / (p[i + 1][0] - p[i][0]);
      return { n: p[i][1] + f * (p[i + 1][1] - p[i][1]), k: p[i][2] + f * (p[i + 1][2] - p[i][2]) };
    }
  }
}

/** Design physical thickness of a layer: given, or QWOT·λref/(4·n(λref)) (shared/FORMATS.md). */
export function designThicknessNm(design: ChamberDesign, layer: ChamberLayer): number {
  if (layer.thicknessNm !== undefined) return layer.thicknessNm;
  if (layer.qwot === undefined) throw new TypeError('chamber simulator: a layer needs thicknessNm or qwot');
  const lambda = design.referenceWavelengthNm;
  return (layer.qwot * lambda) / (4 * dispersion(design.materials[layer.material], lambda).n);
}
