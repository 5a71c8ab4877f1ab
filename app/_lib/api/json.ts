import 'server-only';
import type { Analysis, LayerResultRow } from '@/db/schema';
import type { RunSummaryRow } from '@/db/queries/runList';
import type { RunHeader } from '@/db/queries/runs';

/** A layer result with the keys `analyze` prints (shared/FORMATS.md), then the rest of its detail. */
export function layerJson(l: LayerResultRow) {
  return {
    layer: l.layer,
    material: l.material,
    thicknessNm: l.thicknessNm,
    thicknessSigmaNm: l.thicknessSigmaNm,
    index: l.index,
    indexSigma: l.indexSigma,
    rateNmPerS: l.rateNmPerS,
    cutErrorQwotPct: l.cutErrorQwotPct,
    residualRms: l.residualRms,
    ...l.detail,
  };
}

/** GET /api/analyses/{id}: `error` only when failed, `result` (the `analyze` output) only when done. */
export function analysisJson(a: Analysis, layers?: LayerResultRow[]) {
  return {
    id: String(a.id),
    runId: String(a.runId),
    mode: a.mode,
    state: a.state,
    settings: a.settings,
    createdAt: a.createdAt.toISOString(),
    startedAt: a.startedAt?.toISOString() ?? null,
    finishedAt: a.finishedAt?.toISOString() ?? null,
    ...(a.state === 'failed' ? { error: a.error ?? 'failed' } : {}),
    ...(a.state === 'done' && layers ? { result: { format: 'fringelog.analysis/1', layers: layers.map(layerJson), warnings: a.warnings } } : {}),
  };
}

export function runSummaryJson(r: RunSummaryRow) {
  return {
    id: String(r.id),
    url: `/runs/${r.id}`,
    runCode: r.runCode,
    design: { name: r.designName, revision: r.designRevision },
    chamber: r.chamberName,
    operator: r.operatorName,
    shift: r.shift,
    startedAt: r.startedAt?.toISOString() ?? null,
    uploadedAt: r.createdAt.toISOString(),
    status: r.status,
    disposition: r.disposition,
    analysisState: r.analysisState,
    flagged: r.flagged,
    warningCount: r.warningCount,
    cutsOutsideTolerance: r.cutsOutsideTolerance,
    worstCutErrorQwotPct: r.worstCutErrorQwotPct,
  };
}
export type RunSummaryJson = ReturnType<typeof runSummaryJson>;

export function runJson(h: RunHeader) {
  const r = h.run;
  return {
    id: String(r.id),
    url: `/runs/${r.id}`,
    runCode: r.runCode,
    design: { name: h.design.name, revision: h.design.revision, layerCount: h.design.layerCount },
    chamber: h.chamber.name,
    operator: h.operatorUserName ?? r.operatorName,
    shift: r.shift,
    startedAt: r.startedAt?.toISOString() ?? null,
    uploadedAt: r.createdAt.toISOString(),
    status: r.status,
    disposition: r.disposition,
    trace: h.trace ? { fileName: h.trace.fileName, byteSize: h.trace.byteSize, rowCount: h.trace.rowCount, sha256: h.trace.sha256, columns: h.trace.columns, url: `/api/runs/${r.id}/trace` } : null,
    resultsCsv: `/api/runs/${r.id}/results.csv`,
  };
}
