import 'server-only';
import type PgBoss from 'pg-boss';
import { failAnalysis } from '../queries/analyses';
import { ANALYSIS_QUEUE, ANALYSIS_QUEUE_POLICY, startBoss, type AnalysisJob, type BossOptions } from './queue';
import { runAnalysisJob, type JobHooks, type JobOutcome } from './runAnalysisJob';
import { LEASE_DEFAULTS, startWorkerLease, type LeaseEvent, type LeaseOptions } from './workerLease';

export type WorkerOptions = {
  queue?: string;
  policy?: Partial<PgBoss.Queue>;
  boss?: BossOptions;
  /** Jobs run one after another per worker process (the fit is CPU-bound); start more processes to share the load. */
  pollingIntervalSeconds?: number;
  hooks?: JobHooks;
  onOutcome?: (outcome: JobOutcome) => void;
  /** The beat on running analyses and the sweep for ones whose worker died (db/jobs/workerLease.ts). */
  lease?: Partial<LeaseOptions>;
  onLeaseEvent?: (event: LeaseEvent) => void;
};

/**
 * A worker: takes analysis jobs from the queue and runs them. Any number of these, on this
 * machine or others pointed at the same database, share the queue (pg-boss fetches with
 * SKIP LOCKED). Returns the started pg-boss, to stop it gracefully.
 */
export async function startAnalysisWorker(options: WorkerOptions = {}): Promise<PgBoss> {
  const queue = options.queue ?? ANALYSIS_QUEUE;
  const boss = await startBoss(options.boss, queue, options.policy ?? ANALYSIS_QUEUE_POLICY);
  const lease = startWorkerLease(boss, queue, { ...LEASE_DEFAULTS, ...options.lease }, options.onLeaseEvent);
  boss.on('stopped', () => lease.stop());
  await boss.work<AnalysisJob>(queue, { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: options.pollingIntervalSeconds ?? 1 }, async ([job]) => {
    const { analysisId } = job.data;
    const release = lease.hold(analysisId);
    try {
      const outcome = await runAnalysisJob(analysisId, options.hooks);
      options.onOutcome?.(outcome);
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      console.error(`[fringelog] analysis ${analysisId} (try ${job.retryCount + 1} of ${job.retryLimit + 1}): ${message}`);
      if (job.retryCount >= job.retryLimit) {
        await failAnalysis(analysisId, `the analysis could not be completed after ${job.retryLimit + 1} tries: ${message}`).catch(() => undefined);
      }
      throw err;
    } finally {
      release();
    }
  });
  return boss;
}
