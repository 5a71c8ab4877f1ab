import { type MaterialModel } from './schema';

export interface LibraryMaterial {
  name: string;
  model: MaterialModel;
  description: string;
  source: string;
  /**
   * 'published-fit': coefficients of a published dispersion fit; 'typical-film': representative
   * values for evaporated/sputtered films (real films vary with process by a few 0.01 in n);
   * 'from-memory': a value recalled without a checked source; 'nominal': a defined or round value.
   */
  kind: 'published-fit' | 'typical-film' | 'from-memory' | 'nominal';
}

const TYPICAL_FILM =
  'Typical thin-film values (Cauchy fit through n ≈ values commonly seen for dense e-beam/IAD films), from memory; not a published fit. Fit your own films.';

function film(name: string, description: string, A: number, B: number, C: number, validFromNm: number, validToNm: number): LibraryMaterial {
  return { name, description, source: TYPICAL_FILM, kind: 'typical-film', model: { model: 'cauchy', A, B, C, k: 0, validFromNm, validToNm } };
}

/** Built-in materials; keys are the names a design file may use in place of a model. */
export const materialLibrary: Record<string, LibraryMaterial> = {
  vacuum: {
    name: 'vacuum',
    description: 'Vacuum, n = 1 exactly.',
    source: 'Definition.',
    kind: 'nominal',
    model: { model: 'constant', n: 1, k: 0 },
  },
  air: {
    name: 'air',
    description: 'Air taken as n = 1 (the design format convention); true n ≈ 1.00027 in the visible.',
    source: 'Convention of shared/FORMATS.md; the 1.00027 figure is from memory.',
    kind: 'nominal',
    model: { model: 'constant', n: 1, k: 0 },
  },
  'fused-silica': {
    name: 'fused-silica',
    description: 'Fused silica (bulk), three-term Sellmeier at 20 °C.',
    source: 'I. H. Malitson, "Interspecimen comparison of the refractive index of fused silica", J. Opt. Soc. Am. 55, 1205–1209 (1965).',
    kind: 'published-fit',
    model: {
      model: 'sellmeier',
      B: [0.6961663, 0.4079426, 0.8974794],
      C: [0.0684043, 0.1162414, 9.896161],
      validFromNm: 210,
      validToNm: 3710,
    },
  },
  MgF2: {
    name: 'MgF2',
    description: 'Magnesium fluoride, ordinary ray (bulk crystal), three-term Sellmeier at 19 °C.',
    source:
      'M. J. Dodge, "Refractive properties of magnesium fluoride", Appl. Opt. 23, 1980–1985 (1984); coefficients as listed on refractiveindex.info (MgF2, Dodge-o).',
    kind: 'published-fit',
    model: {
      model: 'sellmeier',
      B: [0.48755108, 0.39875031, 2.3120353],
      C: [0.04338408, 0.09461442, 23.793604],
      validFromNm: 200,
      validToNm: 7000,
    },
  },
  'N-BK7': {
    name: 'N-BK7',
    description: 'Borosilicate crown glass (n_d ≈ 1.5168), three-term Sellmeier; Cᵢ here are √ of the catalogue Cᵢ (µm²).',
    source: 'SCHOTT optical glass data sheet N-BK7 (Sellmeier coefficients B1–B3, C1–C3); coefficients from memory, checked against n_d = 1.5168.',
    kind: 'from-memory',
    model: {
      model: 'sellmeier',
      B: [1.03961212, 0.231792344, 1.01046945],
      C: [Math.sqrt(0.00600069867), Math.sqrt(0.0200179144), Math.sqrt(103.560653)],
      validFromNm: 300,
      validToNm: 2500,
    },
  },
  'crown-glass-1.52': {
    name: 'crown-glass-1.52',
    description: 'Non-dispersive crown glass n = 1.52, the textbook substrate.',
    source: 'Round value used in Macleod, Thin-Film Optical Filters, examples.',
    kind: 'nominal',
    model: { model: 'constant', n: 1.52, k: 0 },
  },
  SiO2: film('SiO2', 'Silicon dioxide film, n(550) ≈ 1.462.', 1.45, 0.0036, 0, 250, 2000),
  TiO2: film('TiO2', 'Titanium dioxide film (dense, IAD-like), n(550) ≈ 2.33; absorbs below ~380 nm.', 2.2, 0.025, 0.0045, 400, 2000),
  Ta2O5: film('Ta2O5', 'Tantalum pentoxide film, n(550) ≈ 2.11.', 2.05, 0.016, 0.0006, 350, 2000),
  Nb2O5: film('Nb2O5', 'Niobium pentoxide film (sputtered-like), n(550) ≈ 2.31.', 2.18, 0.03, 0.0025, 380, 2000),
  HfO2: film('HfO2', 'Hafnium dioxide film, n(550) ≈ 1.98.', 1.94, 0.012, 0, 250, 2000),
  Al2O3: film('Al2O3', 'Aluminium oxide film, n(550) ≈ 1.63.', 1.61, 0.006, 0, 250, 2000),
  ZrO2: film('ZrO2', 'Zirconium dioxide film, n(550) ≈ 2.05.', 1.99, 0.018, 0, 300, 2000),
  'MgF2-film': film('MgF2-film', 'Magnesium fluoride film (hot substrate), n(550) ≈ 1.38.', 1.372, 0.0025, 0, 200, 2000),
};
