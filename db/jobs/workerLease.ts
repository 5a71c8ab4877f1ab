import 'server-only';
import type PgBoss from 'pg-boss';
import { beatAnalyses, failAnalysis, takeStaleAnalyses } from '../queries/analyses';
import { analysisJobId } from './queue';

export type LeaseOptions = {
  /** How often a worker renews the beat of the analyses it holds. */
  heartbeatSeconds: number;
  /** A running analysis with no beat for this long has lost its worker. */
  staleAfterSeconds: number;
  /** How often each worker looks for such analyses. */
  sweepSeconds: number;
};

/**
 * A beat every 10 s, stale after 60 s (six missed beats: a fit holds the event loop for a few
 * seconds at most, the bench's 40-layer run about 2.5 s in all), looked for every 15 s. A killed
 * worker's analysis is back in the queue within about 75 s, not the queue's 15-minute expiry.
 */
export const LEASE_DEFAULTS: LeaseOptions = { heartbeatSeconds: 10, staleAfterSeconds: 60, sweepSeconds: 15 };

export type LeaseEvent =
  | { analysisId: number; kind: 'retried' }
  | { analysisId: number; kind: 'failed'; message: string };

export type WorkerLease = {
  /** Beats for the analysis until the returned function is called. */
  hold(analysisId: number): () => void;
  stop(): void;
};

/**
 * The worker's side of the lease on running analyses. pg-boss learns of a dead worker only when
 * the job's expiry passes; here every worker beats for the analyses it holds and sweeps for ones
 * whose beat stopped. A stale analysis whose job is still active has that job failed, so the
 * queue retries it (another worker's claim takes it over: runAnalysisJob's attempt); one whose
 * job is gone or out of tries is failed with a message. Jobs of another queue are left alone.
 */
export function startWorkerLease(boss: PgBoss, queue: string, options: LeaseOptions = LEASE_DEFAULTS, onEvent?: (e: LeaseEvent) => void): WorkerLease {
  const held = new Map<number, number>();
  const report = (what: string, err: unknown) => console.error(`[fringelog] worker lease: ${what}: ${err instanceof Error ? err.message : String(err)}`);

  const beat = setInterval(() => {
    beatAnalyses([...held.keys()]).catch((err: unknown) => report('beat', err));
  }, options.heartbeatSeconds * 1000);
  beat.unref();

  let sweeping = false;
  const sweep = setInterval(() => {
    if (sweeping) return;
    sweeping = true;
    sweepOnce(boss, queue, options, onEvent)
      .catch((err: unknown) => report('sweep', err))
      .finally(() => (sweeping = false));
  }, options.sweepSeconds * 1000);
  sweep.unref();

  return {
    hold(analysisId) {
      held.set(analysisId, (held.get(analysisId) ?? 0) + 1);
      return () => {
        const n = (held.get(analysisId) ?? 1) - 1;
        if (n > 0) held.set(analysisId, n);
        else held.delete(analysisId);
      };
    },
    stop() {
      clearInterval(beat);
      clearInterval(sweep);
    },
  };
}

async function sweepOnce(boss: PgBoss, queue: string, options: LeaseOptions, onEvent?: (e: LeaseEvent) => void): Promise<void> {
  for (const { id } of await takeStaleAnalyses(options.staleAfterSeconds)) {
    const jobId = analysisJobId(id);
    const find = () => boss.getJobById(queue, jobId, { includeArchive: true });
    let job = await find();
    if (!job) continue; // not this queue's
    if (job.state === 'active') {
      await boss.fail(queue, jobId, { message: `its worker stopped answering (no beat for ${options.staleAfterSeconds} s)` });
      job = await find();
      if (job?.state === 'retry') {
        onEvent?.({ analysisId: id, kind: 'retried' });
        continue;
      }
    }
    if (job && (job.state === 'failed' || job.state === 'completed' || job.state === 'cancelled')) {
      const message = `the worker running this analysis stopped answering and the queue has no try left (job ${job.state} after ${job.retryCount + 1} ${job.retryCount === 0 ? 'try' : 'tries'})`;
      await failAnalysis(id, message);
      onEvent?.({ analysisId: id, kind: 'failed', message });
    }
    // created or retry: waiting for a worker, which will claim it
  }
}
