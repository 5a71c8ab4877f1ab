import { plotPalette } from '@/components/plot/palette';
import { gradeAgainst, SHOP_DEFAULT_TOLERANCE, type ToleranceGrade } from '@/analysis/design/tolerance';

export type { ToleranceGrade };

/** How each grade reads: a word and a shape, so colour is never the only cue. */
export const gradeLooks: Record<ToleranceGrade, { word: string; glyph: string; text: string; fill: string }> = {
  within: { word: 'within tolerance', glyph: '●', text: 'text-leaf', fill: plotPalette.within },
  near: { word: 'near the limit', glyph: '▲', text: 'text-brass-dark', fill: plotPalette.near },
  outside: { word: 'outside tolerance', glyph: '■', text: 'text-alarm', fill: plotPalette.outside },
};

/** One layer's cut error graded against its limit (% QWOT). */
export function cutGrade(cutErrorQwotPct: number, limitQwotPct: number = SHOP_DEFAULT_TOLERANCE.cutErrorQwotPct): ToleranceGrade {
  return gradeAgainst(cutErrorQwotPct, limitQwotPct);
}

const order: Record<ToleranceGrade, number> = { within: 0, near: 1, outside: 2 };

export type RunCutFlag = { grade: ToleranceGrade; layer: number; cutErrorQwotPct: number; limitQwotPct: number } | null;

/**
 * The run's flag for the runs list: its worst-graded layer (ties: the larger share of its limit).
 * `limits` maps a layer to its cut-error limit (parseDesign's layer tolerance); a layer not in
 * it takes the shop default. Null when no layer has a result.
 */
export function runCutFlag(layers: readonly { layer: number; cutErrorQwotPct: number }[], limits: ReadonlyMap<number, number> = new Map()): RunCutFlag {
  let worst: RunCutFlag = null;
  let worstShare = -1;
  for (const l of layers) {
    const limit = limits.get(l.layer) ?? SHOP_DEFAULT_TOLERANCE.cutErrorQwotPct;
    const grade = cutGrade(l.cutErrorQwotPct, limit);
    const share = Math.abs(l.cutErrorQwotPct) / limit;
    if (!worst || order[grade] > order[worst.grade] || (order[grade] === order[worst.grade] && share > worstShare)) {
      worst = { grade, layer: l.layer, cutErrorQwotPct: l.cutErrorQwotPct, limitQwotPct: limit };
      worstShare = share;
    }
  }
  return worst;
}
