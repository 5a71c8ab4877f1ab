import 'server-only';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { AnalysisMode, LayerResult } from '../../analysis/fit';
import { db, type Executor } from '../client';
import { analyses, auditEvents, layerResults, runs, type Analysis, type AnalysisSummary, type LayerResultRow } from '../schema';
import { storeAnalysisSeries, type SeriesOverview } from './series';

export type { AnalysisMode };

/** A new analysis of a run, state 'queued'. */
export async function createAnalysis(
  input: { runId: number; mode: AnalysisMode; settings?: Record<string, unknown>; requestedBy: number | null },
  ex: Executor = db(),
): Promise<Analysis> {
  const [row] = await ex
    .insert(analyses)
    .values({ runId: input.runId, mode: input.mode, settings: input.settings ?? {}, requestedBy: input.requestedBy })
    .returning();
  return row;
}

/**
 * A worker takes the analysis: queued (or running, when an earlier worker died or its job
 * expired) → running, with the attempt number bumped. Returns the new attempt, or null when the
 * analysis is already done or failed (a repeated job has nothing to do).
 */
export async function claimAnalysis(id: number, ex: Executor = db()): Promise<{ attempt: number; analysis: Analysis } | null> {
  const [row] = await ex
    .update(analyses)
    .set({ state: 'running', startedAt: new Date(), heartbeatAt: sql`now()`, attempt: sql`${analyses.attempt} + 1` })
    .where(and(eq(analyses.id, id), inArray(analyses.state, ['queued', 'running'])))
    .returning();
  return row ? { attempt: row.attempt, analysis: row } : null;
}

/** The running worker's beat on the analyses it holds (db/jobs/workerLease.ts). */
export async function beatAnalyses(ids: readonly number[], ex: Executor = db()): Promise<void> {
  if (ids.length === 0) return;
  await ex.update(analyses).set({ heartbeatAt: sql`now()` }).where(and(inArray(analyses.id, [...ids]), eq(analyses.state, 'running')));
}

/**
 * Running analyses whose worker has not beaten for `staleSeconds` (a worker killed, or its machine
 * gone). Each is returned to one caller only: its beat is renewed in the same statement, so other
 * workers' sweeps pass it by for another `staleSeconds`. Rows from before the beat existed count
 * from their start.
 */
export async function takeStaleAnalyses(staleSeconds: number, ex: Executor = db()): Promise<{ id: number; attempt: number }[]> {
  return ex
    .update(analyses)
    .set({ heartbeatAt: sql`now()` })
    .where(and(eq(analyses.state, 'running'), sql`coalesce(${analyses.heartbeatAt}, ${analyses.startedAt}, ${analyses.createdAt}) < now() - make_interval(secs => ${staleSeconds})`))
    .returning({ id: analyses.id, attempt: analyses.attempt });
}

/** queued → running only (attempt + 1); false when it was not queued (taken by someone else, or finished). */
export async function markAnalysisRunning(id: number, ex: Executor = db()): Promise<boolean> {
  const rows = await ex
    .update(analyses)
    .set({ state: 'running', startedAt: new Date(), heartbeatAt: sql`now()`, attempt: sql`${analyses.attempt} + 1` })
    .where(and(eq(analyses.id, id), eq(analyses.state, 'queued')))
    .returning({ id: analyses.id });
  return rows.length === 1;
}

/** The keys of FORMATS.md have their own columns; every other key of the layer result goes to `detail`. */
function layerRow(analysisId: number, l: LayerResult): typeof layerResults.$inferInsert {
  const { layer, material, thicknessNm, thicknessSigmaNm, index, indexSigma, rateNmPerS, cutErrorQwotPct, residualRms, ...detail } = l;
  return { analysisId, layer, material, thicknessNm, thicknessSigmaNm, index, indexSigma, rateNmPerS, cutErrorQwotPct, residualRms, detail };
}

/**
 * Stores a finished analysis: its layer results, warnings, run-level summary and model series, the analysis
 * marked 'done' and the run 'analysed', in one transaction. Refuses (returns false, writes
 * nothing) unless the analysis is still running.
 */
export async function storeAnalysisResult(
  id: number,
  result: {
    layers: readonly LayerResult[];
    warnings: string[];
    summary: AnalysisSummary;
    series?: { model: Float64Array; overview: SeriesOverview };
    cutsOutsideTolerance?: number;
    attempt?: number;
  },
  ex: Executor = db(),
): Promise<boolean> {
  return ex.transaction(async (tx) => {
    const stillOurs = result.attempt === undefined ? undefined : eq(analyses.attempt, result.attempt);
    const [done] = await tx
      .update(analyses)
      .set({ state: 'done', finishedAt: new Date(), warnings: result.warnings, summary: result.summary, error: null, cutsOutsideTolerance: result.cutsOutsideTolerance ?? null })
      .where(and(eq(analyses.id, id), eq(analyses.state, 'running'), stillOurs))
      .returning({ runId: analyses.runId });
    if (!done) return false;
    // Nothing should be there (results are only written with 'done'); clearing keeps a repeat harmless.
    await tx.delete(layerResults).where(eq(layerResults.analysisId, id));
    if (result.layers.length > 0) await tx.insert(layerResults).values(result.layers.map((l) => layerRow(id, l)));
    if (result.series) await storeAnalysisSeries(id, result.series.model, result.series.overview, tx);
    await tx.update(runs).set({ status: 'analysed' }).where(eq(runs.id, done.runId));
    return true;
  });
}

/** Marks a queued or running analysis 'failed' with its message (and the run 'failed' unless an earlier analysis of it succeeded). */
export async function failAnalysis(id: number, message: string, ex: Executor = db(), attempt?: number): Promise<void> {
  await ex.transaction(async (tx) => {
    const [failed] = await tx
      .update(analyses)
      .set({ state: 'failed', finishedAt: new Date(), error: message })
      .where(and(eq(analyses.id, id), inArray(analyses.state, ['queued', 'running']), attempt === undefined ? undefined : eq(analyses.attempt, attempt)))
      .returning({ runId: analyses.runId });
    if (!failed) return;
    const [ok] = await tx.select({ id: analyses.id }).from(analyses).where(and(eq(analyses.runId, failed.runId), eq(analyses.state, 'done'))).limit(1);
    if (!ok) await tx.update(runs).set({ status: 'failed' }).where(eq(runs.id, failed.runId));
  });
}

export type AnalysisWithLayers = { analysis: Analysis; layers: LayerResultRow[] };

export async function findAnalysis(id: number, ex: Executor = db()): Promise<AnalysisWithLayers | undefined> {
  const [analysis] = await ex.select().from(analyses).where(eq(analyses.id, id));
  if (!analysis) return undefined;
  const layers = await ex.select().from(layerResults).where(eq(layerResults.analysisId, id)).orderBy(asc(layerResults.layer));
  return { analysis, layers };
}

/** The newest analysis of a run in each mode, with its layer results. */
export async function latestAnalyses(runId: number, ex: Executor = db()): Promise<Partial<Record<AnalysisMode, AnalysisWithLayers>>> {
  const rows = await ex.selectDistinctOn([analyses.mode]).from(analyses).where(eq(analyses.runId, runId)).orderBy(analyses.mode, desc(analyses.id));
  const out: Partial<Record<AnalysisMode, AnalysisWithLayers>> = {};
  const ids = rows.map((r) => r.id);
  const layers = ids.length ? await ex.select().from(layerResults).where(inArray(layerResults.analysisId, ids)).orderBy(asc(layerResults.layer)) : [];
  for (const analysis of rows) out[analysis.mode] = { analysis, layers: layers.filter((l) => l.analysisId === analysis.id) };
  return out;
}

/** Every analysis of a run, newest first, without layers (the run page's list of earlier results). */
export async function listAnalysesOfRun(runId: number, ex: Executor = db()): Promise<Analysis[]> {
  return ex.select().from(analyses).where(eq(analyses.runId, runId)).orderBy(desc(analyses.id));
}

/** A re-analysis asked for by someone: the queued row and its audit entry (inside the caller's transaction). */
export async function createRequestedAnalysis(input: { runId: number; mode: AnalysisMode; settings: Record<string, unknown>; requestedBy: number | null }, ex: Executor): Promise<Analysis> {
  const analysis = await createAnalysis(input, ex);
  const [run] = await ex.select({ runCode: runs.runCode }).from(runs).where(eq(runs.id, input.runId));
  await ex.insert(auditEvents).values({
    actorId: input.requestedBy,
    action: 'run.reanalysis_queued',
    targetType: 'run',
    targetId: String(input.runId),
    detail: { runCode: run?.runCode ?? null, analysisId: analysis.id, settings: input.settings },
  });
  return analysis;
}
