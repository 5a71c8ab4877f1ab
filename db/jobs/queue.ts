import 'server-only';
import { createHash } from 'node:crypto';
import PgBoss from 'pg-boss';
import { env } from '../env';

export const ANALYSIS_QUEUE = 'analysis';

/**
 * Queue policy, set once when the queue is created (pg-boss keeps the first call's options).
 * Retries with backoff ride out a database that is gone for a moment. A worker killed mid-job is
 * found by the workers' lease within about a minute (db/jobs/workerLease.ts); a job not finished
 * within expireInSeconds is retried by whichever worker is up, as the backstop. The longest
 * analysis seen (40 layers, 10⁶ samples, `npm run bench`) takes well under a minute here.
 */
export const ANALYSIS_QUEUE_POLICY = { retryLimit: 5, retryDelay: 5, retryBackoff: true, expireInSeconds: 15 * 60 } as const;

export type AnalysisJob = { analysisId: number };

/** One job per analysis: a fixed id, so queueing twice is harmless. */
export function analysisJobId(analysisId: number): string {
  const h = createHash('sha256').update(`fringelog-analysis:${analysisId}`).digest('hex');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-8${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

export type BossOptions = Partial<PgBoss.ConstructorOptions>;

/** A started pg-boss on the app's database with the analysis queue created. */
export async function startBoss(options: BossOptions = {}, queue = ANALYSIS_QUEUE, policy: Partial<PgBoss.Queue> = ANALYSIS_QUEUE_POLICY): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: env().DATABASE_URL, application_name: 'fringelog-queue', max: 4, ...options });
  boss.on('error', (err) => console.error(`[fringelog] queue: ${err.message}`));
  await boss.start();
  // Idempotent: a queue that exists keeps the options it was created with.
  await boss.createQueue(queue, { name: queue, ...policy });
  return boss;
}

const globalForBoss = globalThis as unknown as { fringelogSender?: Promise<PgBoss> };

/** The web server's pg-boss: sends jobs only (no maintenance, no schedules; workers do those). */
export function senderBoss(): Promise<PgBoss> {
  globalForBoss.fringelogSender ??= startBoss({ supervise: false, schedule: false }).catch((err: unknown) => {
    globalForBoss.fringelogSender = undefined;
    throw err;
  });
  return globalForBoss.fringelogSender;
}

export async function stopSenderBoss(): Promise<void> {
  const b = globalForBoss.fringelogSender;
  globalForBoss.fringelogSender = undefined;
  if (b) await (await b).stop({ graceful: false, wait: true });
}

/** Queues the job of one analysis; with `db`, inside that transaction (the job exists only if it commits). */
export async function sendAnalysisJob(analysisId: number, db?: PgBoss.Db, queue = ANALYSIS_QUEUE): Promise<void> {
  const boss = await senderBoss();
  const data: AnalysisJob = { analysisId };
  await boss.send(queue, data, { id: analysisJobId(analysisId), ...(db ? { db } : {}) });
}
