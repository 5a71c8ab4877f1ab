import type { ToleranceGrade } from './cutGrade';

/** One layer of an analysis as the run page shows it. */
export type LayerView = {
  layer: number;
  /** The design's symbol, e.g. "H". */
  material: string;
  /** What the symbol stands for, e.g. "TiO2". */
  materialName: string | null;
  chip: number | null;
  wavelengthNm: number | null;
  monitorMode: 'R' | 'T' | null;
  cut: 'turning-point' | 'level' | null;
  designThicknessNm: number | null;
  thicknessNm: number;
  thicknessSigmaNm: number;
  /** (fitted − design) / design · 100. */
  thicknessDeltaPct: number | null;
  /** At the monitor wavelength. */
  index: number;
  indexSigma: number;
  /** index − nominal. */
  indexDeviation: number | null;
  indexHeld: boolean;
  /**
   * The index change from the layer's bottom to its top with its σ, where the analysis tried a
   * graded index (option indexGradient); kept: the layer was fitted as graded, else as uniform.
   */
  indexGradient?: { deltaN: number; sigma: number | null; kept: boolean } | null;
  rateNmPerS: number;
  rateSigmaNmPerS: number | null;
  rateDriftNmPerS2: number | null;
  rateDriftSigmaNmPerS2: number | null;
  cutErrorQwotPct: number;
  cutErrorSigmaQwotPct: number | null;
  cutLimitQwotPct: number;
  cutGrade: ToleranceGrade;
  startTimeS: number | null;
  /** When the layer was cut, s from the start of the trace. */
  cutTimeS: number | null;
  /** When it should have been cut: the modelled turning point, or the target reached on a level cut. */
  idealCutTimeS: number | null;
  /** cutTimeS − idealCutTimeS: positive when the cut came late. */
  cutDeltaS: number | null;
  triggerLevel: number | null;
  residualRms: number;
  residualToNoise: number | null;
  otherModeThicknessNm: number | null;
  /** The two analysis modes' thicknesses differ by more than twice their combined σ. */
  modesDisagree: boolean;
  warnings: string[];
};
