import 'server-only';
import type { AnalysisMode } from '../../analysis/fit';
import { db, type Executor } from '../client';
import { createAnalysis } from '../queries/analyses';
import { runAnalysisJob } from './runAnalysisJob';

export { summaryOf } from './runAnalysisJob';

export type AnalyseOutcome =
  | { analysisId: number; state: 'done'; layers: number; warnings: number }
  | { analysisId: number; state: 'failed'; error: string };

/**
 * Analyses a stored run now, in this process (the seed; the web app queues instead): creates the
 * analysis row and runs it as a worker would. A fault in the design or the trace leaves it
 * 'failed' with the message and no layer results.
 */
export async function analyseStoredRun(
  runId: number,
  mode: AnalysisMode,
  opts: { requestedBy?: number | null; chunkBytes?: number } = {},
  ex: Executor = db(),
): Promise<AnalyseOutcome> {
  const analysis = await createAnalysis({ runId, mode, settings: { mode }, requestedBy: opts.requestedBy ?? null }, ex);
  const outcome = await runAnalysisJob(analysis.id, { chunkBytes: opts.chunkBytes }, ex);
  if (outcome.state === 'skipped') throw new Error(`analysis ${analysis.id} was taken by another worker`);
  if (outcome.state === 'failed') return { analysisId: outcome.analysisId, state: 'failed', error: outcome.error };
  return { analysisId: outcome.analysisId, state: 'done', layers: outcome.layers, warnings: outcome.warnings };
}
