import { randomBytes } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import { readTrace } from '@/analysis/trace';
import { closeDb, db } from '@/db/client';
import { analysisJobId, sendAnalysisJob, stopSenderBoss } from '@/db/jobs/queue';
import { startAnalysisWorker } from '@/db/jobs/worker';
import { runAnalysisJob, type JobOutcome } from '@/db/jobs/runAnalysisJob';
import { createAnalysis, findAnalysis } from '@/db/queries/analyses';
import { findChamberByName } from '@/db/queries/chambers';
import { latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { layerResults } from '@/db/schema';
import { AR1, sample, uniqueCode } from './apiHelpers';

const bosses: PgBoss[] = [];
afterAll(async () => {
  for (const b of bosses) await b.stop({ graceful: false, wait: true }).catch(() => undefined);
  await stopSenderBoss();
  await closeDb();
});

async function until<T>(what: string, probe: () => Promise<T | undefined>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v !== undefined) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A Bay 1 run of the sample AR trace under a code of its own. */
async function ownBay1Run(): Promise<{ id: number }> {
  const file = 'bay1-ar1-run0412.csv';
  const bytes = sample(file);
  const trace = await readTrace([bytes], { fileName: file });
  const revision = await latestDesignRevision(AR1);
  const chamber = await findChamberByName('Bay 1 e-beam');
  const { run } = await createRunWithTrace({
    designRevisionId: revision!.id, chamberId: chamber!.id, runCode: uniqueCode('WF'), uploadedBy: null,
    trace: { fileName: file, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
  return run;
}

describe('analysis workers', () => {
  it('a worker stopped mid-job leaves the analysis to the next worker, which finishes it once; the stopped one cannot write late', async () => {
    const file = 'bay2-bb4-run0587.csv';
    const bytes = sample(file);
    const trace = await readTrace([bytes], { fileName: file });
    const revision = await latestDesignRevision('Larkspur LK-BB4 four-layer broadband visible antireflection');
    const chamber = await findChamberByName('Bay 2 IAD');
    const { run } = await createRunWithTrace({
      designRevisionId: revision!.id,
      chamberId: chamber!.id,
      runCode: uniqueCode('W'),
      uploadedBy: null,
      trace: { fileName: file, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
    });
    const analysis = await createAnalysis({ runId: run.id, mode: 'sequential', requestedBy: null });

    // A queue of this test's own with a short expiry, so the stopped worker's job comes back in seconds, not minutes.
    const queue = `analysis-test-${randomBytes(4).toString('hex')}`;
    const policy = { retryLimit: 3, retryDelay: 1, retryBackoff: false, expireInSeconds: 2 };
    let reachedStore: () => void = () => undefined;
    const atStore = new Promise<void>((r) => (reachedStore = r));
    let release: () => void = () => undefined;
    const held = new Promise<void>((r) => (release = r));
    const firstOutcomes: JobOutcome[] = [];
    const first = await startAnalysisWorker({
      queue,
      policy,
      boss: { maintenanceIntervalSeconds: 1 },
      pollingIntervalSeconds: 0.5,
      hooks: {
        beforeStore: () => {
          reachedStore();
          return held;
        },
      },
      onOutcome: (o) => firstOutcomes.push(o),
    });
    bosses.push(first);
    await sendAnalysisJob(analysis.id, undefined, queue);
    await atStore;
    // The first worker has fitted and is about to store: stop it as a crash would (no graceful wait).
    await first.stop({ graceful: false, wait: false });
    const midway = await findAnalysis(analysis.id);
    expect(midway?.analysis).toMatchObject({ state: 'running', attempt: 1 });
    expect(midway?.layers).toEqual([]);

    const secondOutcomes: JobOutcome[] = [];
    const second = await startAnalysisWorker({ queue, policy, boss: { maintenanceIntervalSeconds: 1 }, pollingIntervalSeconds: 0.5, onOutcome: (o) => secondOutcomes.push(o) });
    bosses.push(second);
    const done = await until('the second worker to finish', async () => {
      const a = await findAnalysis(analysis.id);
      return a?.analysis.state === 'done' ? a : undefined;
    });
    expect(done.analysis.attempt).toBe(2);
    expect(done.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
    expect(secondOutcomes).toEqual([expect.objectContaining({ state: 'done', attempt: 2 })]);

    // The first worker's handler wakes up late: its attempt is no longer current, so it writes nothing.
    release();
    await until('the first worker to give up', async () => (firstOutcomes.length ? true : undefined));
    expect(firstOutcomes).toEqual([{ analysisId: analysis.id, state: 'skipped' }]);
    const rows = await db().select({ n: sql<number>`count(*)::int` }).from(layerResults).where(eq(layerResults.analysisId, analysis.id));
    expect(rows[0].n).toBe(4);
    const job = await db().execute<{ state: string }>(sql`select state from pgboss.job where id = ${analysisJobId(analysis.id)}`);
    expect(job.rows[0]?.state).toBe('completed');
  });

  it('a job queued twice for one analysis is one job; a finished analysis run again is skipped', async () => {
    const queue = `analysis-test-${randomBytes(4).toString('hex')}`;
    const outcomes: JobOutcome[] = [];
    const w = await startAnalysisWorker({ queue, pollingIntervalSeconds: 0.5, onOutcome: (o) => outcomes.push(o) });
    bosses.push(w);
    const [runRow] = (await db().execute<{ id: number }>(sql`select id from runs where run_code = 'B1-0412'`)).rows;
    const analysis = await createAnalysis({ runId: runRow.id, mode: 'refit', settings: { mode: 'refit', gain: 'per-layer' }, requestedBy: null });
    await sendAnalysisJob(analysis.id, undefined, queue);
    await sendAnalysisJob(analysis.id, undefined, queue);
    await until('the analysis to finish', async () => ((await findAnalysis(analysis.id))?.analysis.state === 'done' ? true : undefined));
    const jobs = await db().execute<{ n: number }>(sql`select count(*)::int as n from pgboss.job where name = ${queue}`);
    expect(jobs.rows[0].n).toBe(1);
    expect(outcomes).toEqual([expect.objectContaining({ analysisId: analysis.id, state: 'done', attempt: 1 })]);
    expect(await runAnalysisJob(analysis.id)).toEqual({ analysisId: analysis.id, state: 'skipped' });
    expect((await findAnalysis(analysis.id))?.analysis.attempt).toBe(1);
  });

  it('a database fault mid-job (connection dropped) is retried by the queue and the analysis finishes once', async () => {
    const queue = `analysis-test-${randomBytes(4).toString('hex')}`;
    const outcomes: JobOutcome[] = [];
    let faults = 0;
    const w = await startAnalysisWorker({
      queue,
      policy: { retryLimit: 3, retryDelay: 1, retryBackoff: false, expireInSeconds: 60 },
      pollingIntervalSeconds: 0.5,
      hooks: {
        // As pg reports a server that went away: SQLSTATE 57P01 (admin_shutdown), once.
        beforeStore: () => {
          if (faults++ > 0) return Promise.resolve();
          return Promise.reject(Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }));
        },
      },
      onOutcome: (o) => outcomes.push(o),
    });
    bosses.push(w);
    // A run of this test's own: a newer sequential analysis of a demo run would change what the run list shows for it.
    const runRow = await ownBay1Run();
    const analysis = await createAnalysis({ runId: runRow.id, mode: 'sequential', requestedBy: null });
    await sendAnalysisJob(analysis.id, undefined, queue);
    const done = await until('the retried analysis to finish', async () => {
      const a = await findAnalysis(analysis.id);
      return a?.analysis.state === 'done' ? a : undefined;
    });
    expect(faults).toBe(2);
    expect(done.analysis.attempt).toBe(2);
    expect(done.layers.map((l) => l.layer)).toEqual([1]);
    expect(outcomes).toEqual([expect.objectContaining({ analysisId: analysis.id, state: 'done', attempt: 2 })]);
  });
});
