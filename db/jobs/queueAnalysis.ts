import 'server-only';
import { createAnalysis } from '../queries/analyses';
import { withTransaction } from '../queries/transaction';
import { auditEvents, type Analysis } from '../schema';
import type { AnalysisSettings } from './analysisSettings';
import { sendAnalysisJob } from './queue';

/** Queues a new analysis of a stored run with these settings (re-analysis); the row, its job and the audit entry in one transaction. */
export async function queueAnalysis(runId: number, settings: AnalysisSettings, requestedBy: number | null): Promise<Analysis> {
  return withTransaction(async (tx, raw) => {
    const analysis = await createAnalysis({ runId, mode: settings.mode, settings, requestedBy }, tx);
    await sendAnalysisJob(analysis.id, raw);
    await tx.insert(auditEvents).values({ actorId: requestedBy, action: 'run.reanalysis_queued', targetType: 'run', targetId: String(runId), detail: { analysisId: analysis.id, settings } });
    return analysis;
  });
}
