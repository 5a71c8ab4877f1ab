import 'server-only';
import { AnalysisInputError, analyzeRun, type AnalysisMode, type AnalysisResult } from '../../analysis/fit';
import { DesignFormatError, parseDesign } from '../../analysis/design';
import { readTrace, TraceFormatError } from '../../analysis/trace';
import { db, type Executor } from '../client';
import { createAnalysis, failAnalysis, markAnalysisRunning, storeAnalysisResult } from '../queries/analyses';
import { findRunForAnalysis, traceFileChunks } from '../queries/runs';
import { hasRunSeries, storeRunSeries } from '../queries/series';
import { OVERVIEW_POINTS, plotPoints } from './seriesOverview';
import type { AnalysisSummary } from '../schema';
import { toJsonValue } from './toJsonValue';

export type AnalyseOutcome =
  | { analysisId: number; state: 'done'; layers: number; warnings: number }
  | { analysisId: number; state: 'failed'; error: string };

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

/**
 * Analyses a stored run: reads its raw trace back from the database in chunks, parses it against
 * its design revision, runs analysis/fit analyzeRun in the given mode and stores the result.
 * The analysis row is written first ('running'); a fault in the design or the trace leaves it
 * 'failed' with the message and no layer results.
 */
export async function analyseStoredRun(
  runId: number,
  mode: AnalysisMode,
  opts: {
    requestedBy?: number | null;
    chunkBytes?: number;
    /** Called once the result is stored (e.g. tolerance alerts); its failure is logged, the analysis stays stored. */
    onStored?: (analysisId: number) => Promise<unknown>;
  } = {},
  ex: Executor = db(),
): Promise<AnalyseOutcome> {
  const stored = await findRunForAnalysis(runId, ex);
  if (!stored) throw new Error(`run ${runId} not found (or it has no trace file)`);
  const settings = { mode };
  const analysis = await createAnalysis({ runId, mode, settings, requestedBy: opts.requestedBy ?? null }, ex);
  await markAnalysisRunning(analysis.id, ex);
  let result: AnalysisResult;
  let trace: Awaited<ReturnType<typeof readTrace>>;
  try {
    const designFile = stored.revision.sourceFileName ?? `${stored.revision.name} (revision ${stored.revision.revision})`;
    const design = parseDesign(stored.revision.document, designFile);
    trace = await readTrace(traceFileChunks(runId, opts.chunkBytes, ex), { fileName: stored.trace.fileName, layerCount: design.layers.length });
    result = await analyzeRun(design, trace, { ...settings, modelSeries: true });
  } catch (err) {
    const error = messageOf(err);
    await failAnalysis(analysis.id, error, ex);
    return { analysisId: analysis.id, state: 'failed', error };
  }
  try {
    // The samples as plotted are kept once per run; the model once per analysis, with its results.
    await storeRunSeries(runId, trace.timeS, trace.signal, ex);
    const series = result.model ? { model: result.model, overview: plotPoints(trace.timeS, trace.signal, result.model, OVERVIEW_POINTS) } : undefined;
    await storeAnalysisResult(analysis.id, { layers: result.layers, warnings: result.warnings, summary: summaryOf(result), series }, ex);
  } catch (err) {
    await failAnalysis(analysis.id, messageOf(err), ex);
    throw err;
  }
  if (opts.onStored) {
    try {
      await opts.onStored(analysis.id);
    } catch (err) {
      console.error(`[fringelog] after analysis ${analysis.id} was stored:`, err);
    }
  }
  return { analysisId: analysis.id, state: 'done', layers: result.layers.length, warnings: result.warnings.length };
}

/** Stores the run's samples for plotting from its raw trace, when no analysis has done so yet. */
export async function ensureRunSeries(runId: number, ex: Executor = db()): Promise<void> {
  if (await hasRunSeries(runId, ex)) return;
  const stored = await findRunForAnalysis(runId, ex);
  if (!stored) return;
  const trace = await readTrace(traceFileChunks(runId, undefined, ex), { fileName: stored.trace.fileName });
  await storeRunSeries(runId, trace.timeS, trace.signal, ex);
}
