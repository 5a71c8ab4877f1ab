import { type ChamberMaterial } from './design';

// Material models for the test designs, given in full (the simulator keeps no library).
/** Fused silica, I. H. Malitson, J. Opt. Soc. Am. 55, 1205 (1965). */
export const SILICA: ChamberMaterial = { model: 'sellmeier', B: [0.6961663, 0.4079426, 0.8974794], C: [0.0684043, 0.1162414, 9.896161] };
/** Films: Cauchy coefficients of typical dense e-beam/IAD films (from memory, rounded; test data only). */
export const TIO2_FILM: ChamberMaterial = { model: 'cauchy', A: 2.2, B: 0.03, C: 0.004, k: 0 };
export const TA2O5_FILM: ChamberMaterial = { model: 'cauchy', A: 2.05, B: 0.018, C: 0.001, k: 0 };
export const SIO2_FILM: ChamberMaterial = { model: 'cauchy', A: 1.45, B: 0.0036, C: 0, k: 0 };
export const MGF2_FILM: ChamberMaterial = { model: 'constant', n: 1.38, k: 0 };
export const CROWN: ChamberMaterial = { model: 'constant', n: 1.52, k: 0 };
