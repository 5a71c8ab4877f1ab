import 'server-only';
import { newestPointRules, type RuleNumber } from '../../analysis/stats';
import { db, type Executor } from '../client';
import { findAnalysisForAlert, outOfToleranceLayers, type AnalysisForAlert, type FlaggedLayer } from '../queries/alerts';
import { compareMetrics, compareSeriesAllLayers, type CompareMetric } from '../queries/compare';

export type RuleAlert = { layer: number; figure: CompareMetric; value: number; rules: RuleNumber[] };
export type AnalysisAlert = { analysis: AnalysisForAlert; outOfTolerance: FlaggedLayer[]; controlRules: RuleAlert[] };

/**
 * What a finished analysis has to report: its layers beyond tolerance, and the Western Electric
 * rules its run completes on its chamber's chart of the same design and mode (each layer and
 * figure; limits from the 20 runs before it, no verdict on fewer than 8). Undefined when the
 * analysis is not finished.
 */
export async function analysisAlert(analysisId: number, ex: Executor = db()): Promise<AnalysisAlert | undefined> {
  const analysis = await findAnalysisForAlert(analysisId, ex);
  if (!analysis) return undefined;
  const outOfTolerance = await outOfToleranceLayers(analysisId, ex);
  const controlRules: RuleAlert[] = [];
  if (analysis.startedAt) {
    const filter = {
      designId: analysis.designId, revision: null, from: new Date(0), to: new Date(analysis.startedAt.getTime() + 1),
      chamberIds: [analysis.chamberId], shifts: [], mode: analysis.mode,
    };
    for (const figure of compareMetrics) {
      const points = await compareSeriesAllLayers(filter, figure, ex);
      for (const layer of [...new Set(points.map((p) => p.layer))]) {
        const mine = points.filter((p) => p.layer === layer);
        const at = mine.findIndex((p) => p.runId === analysis.runId);
        if (at < 0) continue;
        const rules = newestPointRules(mine.slice(0, at).map((p) => p.value), mine[at].value);
        if (rules.length) controlRules.push({ layer, figure, value: mine[at].value, rules });
      }
    }
  }
  return { analysis, outOfTolerance, controlRules };
}
