import 'server-only';
import { createRequestedAnalysis } from '../queries/analyses';
import { withTransaction } from '../queries/transaction';
import type { Analysis } from '../schema';
import type { AnalysisSettings } from './analysisSettings';
import { sendAnalysisJob } from './queue';

/** Queues a new analysis of a stored run with these settings (re-analysis): the row, its audit entry and its job in one transaction. */
export async function queueAnalysis(runId: number, settings: AnalysisSettings, requestedBy: number | null): Promise<Analysis> {
  return withTransaction(async (tx, raw) => {
    const analysis = await createRequestedAnalysis({ runId, mode: settings.mode, settings, requestedBy }, tx);
    await sendAnalysisJob(analysis.id, raw);
    return analysis;
  });
}
