import { type Tolerance } from './schema';

/**
 * The shop's limits where a design gives none (common practice for visible AR and mirror work;
 * a shop sets its own in the design file).
 */
export const SHOP_DEFAULT_TOLERANCE: Required<Tolerance> = {
  thicknessPct: 2,
  indexAbs: 0.02,
  cutErrorQwotPct: 2,
};

/** A layer's limits: its own, else the design's `tolerance`, else the shop's default. */
export function layerTolerance(layer?: Tolerance, design?: Tolerance): Required<Tolerance> {
  return {
    thicknessPct: layer?.thicknessPct ?? design?.thicknessPct ?? SHOP_DEFAULT_TOLERANCE.thicknessPct,
    indexAbs: layer?.indexAbs ?? design?.indexAbs ?? SHOP_DEFAULT_TOLERANCE.indexAbs,
    cutErrorQwotPct: layer?.cutErrorQwotPct ?? design?.cutErrorQwotPct ?? SHOP_DEFAULT_TOLERANCE.cutErrorQwotPct,
  };
}

export type ToleranceGrade = 'within' | 'near' | 'outside';

/**
 * Grades |value| against a limit: `near` from 70 % of the limit (common practice: a warning band
 * before the limit itself), `outside` beyond it.
 */
export function gradeAgainst(value: number, limit: number): ToleranceGrade {
  const a = Math.abs(value);
  if (!(a <= limit)) return 'outside';
  return a >= 0.7 * limit ? 'near' : 'within';
}
