import 'server-only';
import type { AnalysisMode } from '../../analysis/fit';
import { db, type Executor } from '../client';
import { createAnalysis } from '../queries/analyses';
import { findRunForAnalysis, traceFileChunks } from '../queries/runs';
import { hasRunSeries, storeRunSeries } from '../queries/series';
import { readTrace } from '../../analysis/trace';
import { runAnalysisJob } from './runAnalysisJob';

export { summaryOf } from './runAnalysisJob';

export type AnalyseOutcome =
  | { analysisId: number; state: 'done'; layers: number; warnings: number; notes: number }
  | { analysisId: number; state: 'failed'; error: string };

/**
 * Analyses a stored run now, in this process (the seed; the web app queues instead): creates the
 * analysis row and runs it as a worker would. A fault in the design or the trace leaves it
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
  const analysis = await createAnalysis({ runId, mode, settings: { mode }, requestedBy: opts.requestedBy ?? null }, ex);
  const outcome = await runAnalysisJob(analysis.id, { chunkBytes: opts.chunkBytes, onStored: opts.onStored }, ex);
  if (outcome.state === 'skipped') throw new Error(`analysis ${analysis.id} was taken by another worker`);
  if (outcome.state === 'failed') return { analysisId: outcome.analysisId, state: 'failed', error: outcome.error };
  return { analysisId: outcome.analysisId, state: 'done', layers: outcome.layers, warnings: outcome.warnings, notes: outcome.notes };
}

/** Stores the run's samples for plotting from its raw trace, when no analysis has done so yet. */
export async function ensureRunSeries(runId: number, ex: Executor = db()): Promise<void> {
  if (await hasRunSeries(runId, ex)) return;
  const stored = await findRunForAnalysis(runId, ex);
  if (!stored) return;
  const trace = await readTrace(traceFileChunks(runId, undefined, ex), { fileName: stored.trace.fileName });
  await storeRunSeries(runId, trace.timeS, trace.signal, ex);
}
