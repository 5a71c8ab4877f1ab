import 'server-only';
import { AnalysisInputError, analyzeRun, type AnalysisMode, type AnalysisResult } from '../../analysis/fit';
import { DesignFormatError, parseDesign } from '../../analysis/design';
import { readTrace, TraceFormatError } from '../../analysis/trace';
import { db, type Executor } from '../client';
import { createAnalysis, failAnalysis, markAnalysisRunning, storeAnalysisResult } from '../queries/analyses';
import { findRunForAnalysis, traceFileChunks } from '../queries/runs';
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
  const { layers: _layers, warnings: _warnings, ...rest } = result;
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
  opts: { requestedBy?: number | null; chunkBytes?: number } = {},
  ex: Executor = db(),
): Promise<AnalyseOutcome> {
  const stored = await findRunForAnalysis(runId, ex);
  if (!stored) throw new Error(`run ${runId} not found (or it has no trace file)`);
  const settings = { mode };
  const analysis = await createAnalysis({ runId, mode, settings, requestedBy: opts.requestedBy ?? null }, ex);
  await markAnalysisRunning(analysis.id, ex);
  let result: AnalysisResult;
  try {
    const designFile = stored.revision.sourceFileName ?? `${stored.revision.name} (revision ${stored.revision.revision})`;
    const design = parseDesign(stored.revision.document, designFile);
    const trace = await readTrace(traceFileChunks(runId, opts.chunkBytes, ex), { fileName: stored.trace.fileName, layerCount: design.layers.length });
    result = await analyzeRun(design, trace, settings);
  } catch (err) {
    const error = messageOf(err);
    await failAnalysis(analysis.id, error, ex);
    return { analysisId: analysis.id, state: 'failed', error };
  }
  try {
    await storeAnalysisResult(analysis.id, { layers: result.layers, warnings: result.warnings, summary: summaryOf(result) }, ex);
  } catch (err) {
    await failAnalysis(analysis.id, messageOf(err), ex);
    throw err;
  }
  return { analysisId: analysis.id, state: 'done', layers: result.layers.length, warnings: result.warnings.length };
}
