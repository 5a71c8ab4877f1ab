import 'server-only';
import { parseDesign, planLayer, type Design } from '@/analysis/design';
import type { AnalysisWithLayers } from '@/db/queries/analyses';
import type { DriftView } from '@/components/runs/IndexDriftList';
import type { LayerView } from '@/components/runs/layerView';
import { cutGrade } from '@/components/runs/cutGrade';
import type { TraceLayerSpan } from '@/components/runs/traceMarks';

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
/** A layer's index-gradient trial, from the keys the analysis adds when it made one. */
const gradientOf = (d: Record<string, unknown>): LayerView['indexGradient'] => {
  const deltaN = num(d.indexGradient);
  return deltaN === null ? null : { deltaN, sigma: num(d.indexGradientSigma), kept: d.indexGradientKept === true };
};
const strings = (v: unknown): string[] => (Array.isArray(v) ? v.filter((w): w is string => typeof w === 'string') : []);

type Chip = { chip: number; gain: number; offset: number; noiseSigma: number; source: string; refinedGain?: number; refinedGainSigma?: number; gainDriftPerHour?: number; gainDriftSigmaPerHour?: number };

export function chipRows(a: AnalysisWithLayers): Chip[] {
  const list = a.analysis.summary?.chips;
  return Array.isArray(list) ? (list as Chip[]).filter((c) => typeof c?.chip === 'number') : [];
}

/** The design's name for each material symbol ("H" → "TiO2"); a symbol that is itself a library name stands for itself. */
export function materialNames(document: unknown): Record<string, string> {
  const m = (document as { materials?: Record<string, unknown> } | null)?.materials ?? {};
  return Object.fromEntries(Object.entries(m).map(([k, v]) => [k, typeof v === 'string' ? v : 'own dispersion model']));
}

/**
 * Stored layer results as the page shows them (FORMATS.md keys from their columns, the rest from
 * detail), graded against the design's tolerances, with the other mode's thickness to compare.
 */
export function layerRows(a: AnalysisWithLayers, design: Design | null = null, other: AnalysisWithLayers | null = null, names: Record<string, string> = {}): LayerView[] {
  const chips = new Map(chipRows(a).map((c) => [c.chip, c]));
  const otherBy = new Map((other?.layers ?? []).map((l) => [l.layer, l]));
  return a.layers.map((l) => {
    const d = l.detail;
    const designLayer = design?.layers[l.layer - 1];
    const limit = designLayer?.tolerance.cutErrorQwotPct;
    const designThicknessNm = num(d.designThicknessNm);
    const cutTimeS = num(d.cutTimeS);
    const idealCutTimeS = num(d.idealCutTimeS);
    const chip = num(d.chip);
    const gain = num(d.gain);
    let triggerLevel: number | null = null;
    if (d.cut === 'level' && design && gain !== null && chip !== null) {
      try {
        triggerLevel = (chips.get(chip)?.offset ?? 0) + gain * planLayer(design, l.layer).cutSignal;
      } catch {
        triggerLevel = null;
      }
    }
    const o = otherBy.get(l.layer);
    const combined = o ? Math.hypot(o.thicknessSigmaNm, l.thicknessSigmaNm) : NaN;
    const modesDisagree = o !== undefined && Math.abs(o.thicknessNm - l.thicknessNm) > 2 * combined;
    return {
      layer: l.layer,
      material: l.material,
      materialName: names[l.material] ?? null,
      chip,
      wavelengthNm: num(d.wavelengthNm),
      monitorMode: d.mode === 'R' ? 'R' : d.mode === 'T' ? 'T' : null,
      cut: d.cut === 'level' ? 'level' : d.cut === 'turning-point' ? 'turning-point' : null,
      designThicknessNm,
      thicknessNm: l.thicknessNm,
      thicknessSigmaNm: l.thicknessSigmaNm,
      thicknessDeltaPct: designThicknessNm ? ((l.thicknessNm - designThicknessNm) / designThicknessNm) * 100 : null,
      index: l.index,
      indexSigma: l.indexSigma,
      indexDeviation: num(d.indexDeviation),
      indexHeld: d.indexHeld === true,
      indexGradient: gradientOf(d),
      rateNmPerS: l.rateNmPerS,
      rateSigmaNmPerS: num(d.rateSigmaNmPerS),
      rateDriftNmPerS2: num(d.rateDriftNmPerS2),
      rateDriftSigmaNmPerS2: num(d.rateDriftSigmaNmPerS2),
      cutErrorQwotPct: l.cutErrorQwotPct,
      cutErrorSigmaQwotPct: num(d.cutErrorSigmaQwotPct),
      cutLimitQwotPct: limit ?? 2,
      cutGrade: cutGrade(l.cutErrorQwotPct, limit),
      startTimeS: num(d.startTimeS),
      cutTimeS,
      idealCutTimeS,
      cutDeltaS: cutTimeS !== null && idealCutTimeS !== null ? cutTimeS - idealCutTimeS : null,
      triggerLevel,
      residualRms: l.residualRms,
      residualToNoise: num(d.residualToNoise),
      otherModeThicknessNm: o?.thicknessNm ?? null,
      modesDisagree,
      warnings: strings(d.warnings),
    };
  });
}

/** The run's stored design document parsed, or null when it no longer parses (the page then shows no tolerances from it). */
export function designOf(document: unknown): Design | null {
  try {
    return parseDesign(document);
  } catch {
    return null;
  }
}

/** What the trace plot needs of each layer. */
export function traceSpans(rows: readonly LayerView[]): TraceLayerSpan[] {
  return rows
    .filter((r) => r.startTimeS !== null && r.cutTimeS !== null)
    .map((r) => ({
      layer: r.layer, material: r.material, chip: r.chip ?? 1, startTimeS: r.startTimeS!, cutTimeS: r.cutTimeS!,
      idealCutTimeS: r.idealCutTimeS, grade: r.cutGrade, triggerLevel: r.triggerLevel,
    }))
    .sort((a, b) => a.startTimeS - b.startTimeS);
}

export type DriftSeries = DriftView & {
  timeS: number[]; deviation: number[]; /** Each point's own index σ (the stored drift's; else the layer's; NaN where unknown). */ sigma: number[];
  slopePerLayer: number | null; slopePerLayerSigma: number | null; interceptPerLayer: number | null; interceptPerHour: number | null;
};

/** The per-material index drift of the run-level summary. */
export function driftRows(a: AnalysisWithLayers): DriftSeries[] {
  const list = a.analysis.summary?.indexDrift;
  if (!Array.isArray(list)) return [];
  const sigmaOf = new Map(a.layers.map((l) => [l.layer, l.indexSigma]));
  return list.map((d: Record<string, unknown>) => {
    const byTime = (d.byTime ?? {}) as Record<string, unknown>;
    const byOrder = (d.byOrder ?? {}) as Record<string, unknown>;
    const arr = (v: unknown) => (Array.isArray(v) ? v.map(Number) : []);
    return {
      material: String(d.material),
      layers: arr(d.layers),
      timeS: arr(d.timeS),
      deviation: arr(d.deviation),
      // the drift's own σ (each layer's own reading, fit/runSummary.ts); older analyses stored none
      sigma: Array.isArray(d.sigma) ? arr(d.sigma) : arr(d.layers).map((l) => sigmaOf.get(l) ?? NaN),
      meanDeviation: num(d.meanDeviation),
      // the line's weighting (analysis/stats/indexDrift.ts); analyses stored before it drew an unweighted one
      method: d.method === 'random-effects' || d.method === 'weighted' ? d.method : 'unweighted',
      slopePerHour: num(byTime.slope),
      slopeSigmaPerHour: num(byTime.slopeSigma),
      interceptPerHour: num(byTime.intercept),
      slopePerLayer: num(byOrder.slope),
      slopePerLayerSigma: num(byOrder.slopeSigma),
      interceptPerLayer: num(byOrder.intercept),
    };
  });
}

/** An index trend in time more than twice its σ, raised into the run's warnings. */
export function driftWarnings(drift: readonly DriftSeries[], names: Record<string, string>): string[] {
  return drift
    .filter((d) => d.slopePerHour !== null && d.slopeSigmaPerHour !== null && Math.abs(d.slopePerHour) > 2 * d.slopeSigmaPerHour)
    .map((d) => {
      const sign = d.slopePerHour! > 0 ? '+' : '−';
      const who = names[d.material] ? `${d.material} (${names[d.material]})` : d.material;
      return `index of ${who} drifting ${sign}${Math.abs(d.slopePerHour!).toFixed(4)} ± ${d.slopeSigmaPerHour!.toFixed(4)} per hour over ${d.layers.length} fitted layers: more than twice its σ`;
    });
}

/** The run id of the address, or null when it is not a plain positive number. */
export function parseRunId(segment: string): number | null {
  return /^[1-9]\d{0,8}$/.test(segment) ? Number(segment) : null;
}
