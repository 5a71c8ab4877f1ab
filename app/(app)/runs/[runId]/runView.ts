import 'server-only';
import type { AnalysisWithLayers } from '@/db/queries/analyses';
import type { DriftView } from '@/components/runs/IndexDriftList';
import type { LayerRowView } from '@/components/runs/LayerTable';

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** Stored layer results as the layer table shows them (FORMATS.md keys from their columns, the rest from detail). */
export function layerRows(a: AnalysisWithLayers): LayerRowView[] {
  return a.layers.map((l) => ({
    layer: l.layer,
    material: l.material,
    chip: num(l.detail.chip),
    designThicknessNm: num(l.detail.designThicknessNm),
    thicknessNm: l.thicknessNm,
    thicknessSigmaNm: l.thicknessSigmaNm,
    index: l.index,
    indexSigma: l.indexSigma,
    indexHeld: l.detail.indexHeld === true,
    rateNmPerS: l.rateNmPerS,
    cutErrorQwotPct: l.cutErrorQwotPct,
    cutTimeS: num(l.detail.cutTimeS),
    idealCutTimeS: num(l.detail.idealCutTimeS),
    residualRms: l.residualRms,
    warnings: Array.isArray(l.detail.warnings) ? l.detail.warnings.filter((w): w is string => typeof w === 'string') : [],
  }));
}

/** The per-material index drift of the run-level summary. */
export function driftRows(a: AnalysisWithLayers): DriftView[] {
  const list = a.analysis.summary?.indexDrift;
  if (!Array.isArray(list)) return [];
  return list.map((d: Record<string, unknown>) => {
    const byTime = (d.byTime ?? {}) as Record<string, unknown>;
    return {
      material: String(d.material),
      layers: Array.isArray(d.layers) ? d.layers.map(Number) : [],
      meanDeviation: num(d.meanDeviation),
      slopePerHour: num(byTime.slope),
      slopeSigmaPerHour: num(byTime.slopeSigma),
    };
  });
}

/** The run id of the address, or null when it is not a plain positive number. */
export function parseRunId(segment: string): number | null {
  return /^[1-9]\d{0,8}$/.test(segment) ? Number(segment) : null;
}
