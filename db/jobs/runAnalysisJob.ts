import 'server-only';
import { AnalysisInputError, analyzeRun, type AnalysisResult, type LayerResult } from '../../analysis/fit';
import { warningCount } from '../../analysis/fit/analysisNotes';
import { DesignFormatError, gradeAgainst, parseDesign, type Design } from '../../analysis/design';
import { readTrace, TraceFormatError } from '../../analysis/trace';
import { db, type Executor } from '../client';
import { claimAnalysis, failAnalysis, storeAnalysisResult } from '../queries/analyses';
import { findRunForAnalysis, traceFileChunks } from '../queries/runs';
import { storeRunSeries } from '../queries/series';
import type { AnalysisSummary } from '../schema';
import { analysisSettingsSchema } from './analysisSettings';
import { OVERVIEW_POINTS, plotPoints } from './seriesOverview';
import { toJsonValue } from './toJsonValue';

export type JobOutcome =
  /** warnings: the run's warnings; notes: its messages that say what the analysis did (analysis/fit/analysisNotes.ts). */
  | { analysisId: number; state: 'done'; layers: number; warnings: number; notes: number; attempt: number }
  | { analysisId: number; state: 'failed'; error: string; attempt: number }
  /** Already finished (a repeated job), or taken over by a newer attempt before this one could store. */
  | { analysisId: number; state: 'skipped' };

export type JobHooks = {
  chunkBytes?: number;
  /** Called after the fit, before the result is stored (tests stop a worker here, as a crash would). */
  beforeStore?: () => Promise<void>;
  /** Called once the result is stored (e.g. tolerance alerts); its failure is logged, the analysis stays stored. */
  onStored?: (analysisId: number) => Promise<unknown>;
};

/** Input faults get their own message (file, line, column or key); anything else is reported as an internal failure. */
function messageOf(err: unknown): string {
  if (err instanceof TraceFormatError || err instanceof DesignFormatError || err instanceof AnalysisInputError) return err.message;
  return `the analysis stopped on an internal error: ${err instanceof Error ? err.message : String(err)}`;
}

/** The run-level part of the result, typed arrays as plain arrays, ready for jsonb. */
export function summaryOf(result: AnalysisResult): AnalysisSummary {
  const { layers: _layers, warnings: _warnings, model: _model, ...rest } = result;
  return toJsonValue(rest) as AnalysisSummary;
}

/** Layers whose |cut error| is outside their tolerance (layer, then design, then shop default). */
export function cutsOutsideTolerance(design: Design, layers: readonly LayerResult[]): number {
  return layers.filter((l) => {
    const limit = design.layers[l.layer - 1]?.tolerance.cutErrorQwotPct;
    return limit !== undefined && gradeAgainst(l.cutErrorQwotPct, limit) === 'outside';
  }).length;
}

/**
 * Runs one queued analysis: takes it (attempt + 1), reads the run's raw trace back in chunks,
 * parses it against its design revision, runs analyzeRun with the analysis's settings, and stores
 * the result in one transaction, only if this attempt still holds the analysis. A fault of the
 * file or design, or of the fit itself, fails the analysis with its message (retrying would not
 * help); a database fault is thrown, for the queue to retry with backoff. Safe to run twice.
 */
export async function runAnalysisJob(analysisId: number, hooks: JobHooks = {}, ex: Executor = db()): Promise<JobOutcome> {
  const claimed = await claimAnalysis(analysisId, ex);
  if (!claimed) return { analysisId, state: 'skipped' };
  const { attempt, analysis } = claimed;
  const stored = await findRunForAnalysis(analysis.runId, ex);
  if (!stored) {
    await failAnalysis(analysisId, `run ${analysis.runId} has no trace file`, ex, attempt);
    return { analysisId, state: 'failed', error: 'the run has no trace file', attempt };
  }
  let result: AnalysisResult;
  let design: Design;
  let trace: Awaited<ReturnType<typeof readTrace>>;
  try {
    const settings = analysisSettingsSchema.parse({ ...analysis.settings, mode: analysis.mode });
    const designFile = stored.revision.sourceFileName ?? `${stored.revision.name} (revision ${stored.revision.revision})`;
    design = parseDesign(stored.revision.document, designFile);
    trace = await readTrace(traceFileChunks(analysis.runId, hooks.chunkBytes, ex), { fileName: stored.trace.fileName, layerCount: design.layers.length });
    result = await analyzeRun(design, trace, { ...settings, modelSeries: true });
  } catch (err) {
    if (isDatabaseFault(err)) throw err;
    const error = messageOf(err);
    await failAnalysis(analysisId, error, ex, attempt);
    return { analysisId, state: 'failed', error, attempt };
  }
  await hooks.beforeStore?.();
  // The samples as plotted are kept once per run (a repeat is a no-op); the model once per analysis, with its results.
  await storeRunSeries(analysis.runId, trace.timeS, trace.signal, ex);
  const series = result.model ? { model: result.model, overview: plotPoints(trace.timeS, trace.signal, result.model, OVERVIEW_POINTS) } : undefined;
  const ok = await storeAnalysisResult(
    analysisId,
    { layers: result.layers, warnings: result.warnings, summary: summaryOf(result), series, cutsOutsideTolerance: cutsOutsideTolerance(design, result.layers), attempt },
    ex,
  );
  if (!ok) return { analysisId, state: 'skipped' };
  if (hooks.onStored) {
    try {
      await hooks.onStored(analysisId);
    } catch (err) {
      console.error(`[fringelog] after analysis ${analysisId} was stored:`, err);
    }
  }
  const warnings = warningCount(result.warnings);
  return { analysisId, state: 'done', layers: result.layers.length, warnings, notes: result.warnings.length - warnings, attempt };
}

/** Errors from pg (connection lost, server shutting down) carry a SQLSTATE or a socket code. */
export function isDatabaseFault(err: unknown): boolean {
  const e = err as { code?: unknown; message?: unknown } | null;
  if (!e || typeof e !== 'object') return false;
  if (typeof e.code === 'string' && /^(08|53|57|58)/.test(e.code)) return true;
  if (typeof e.code === 'string' && ['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT'].includes(e.code)) return true;
  return typeof e.message === 'string' && /Connection terminated|connection timeout/i.test(e.message);
}
