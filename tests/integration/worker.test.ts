import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import { readTrace } from '@/analysis/trace';
import { closeDb, db } from '@/db/client';
import { analysisJobId, sendAnalysisJob, startBoss, stopSenderBoss } from '@/db/jobs/queue';
import { startAnalysisWorker } from '@/db/jobs/worker';
import { runAnalysisJob, type JobOutcome } from '@/db/jobs/runAnalysisJob';
import { createAnalysis, findAnalysis } from '@/db/queries/analyses';
import { findChamberByName } from '@/db/queries/chambers';
import { latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { layerResults } from '@/db/schema';
import { sample, uniqueCode } from './apiHelpers';

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

const AR4 = { file: 'bay2-bb4-run0587.csv', design: 'Larkspur LK-BB4 four-layer broadband visible antireflection', chamber: 'Bay 2 IAD' };
const AR1 = { file: 'bay1-ar1-run0412.csv', design: 'Larkspur LK-AR1 single-layer MgF2 antireflection on crown glass', chamber: 'Bay 1 e-beam' };

/** A run of the test's own on a sample trace (a new analysis of a demo run would change which is its newest). */
async function ownRun(prefix: string, { file, design, chamber: chamberName } = AR4) {
  const bytes = sample(file);
  const trace = await readTrace([bytes], { fileName: file });
  const revision = await latestDesignRevision(design);
  const chamber = await findChamberByName(chamberName);
  const { run } = await createRunWithTrace({
    designRevisionId: revision!.id, chamberId: chamber!.id, runCode: uniqueCode(prefix), uploadedBy: null,
    trace: { fileName: file, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
  return run;
}

describe('analysis workers', () => {
  it('a worker stopped mid-job leaves the analysis to the next worker, which finishes it once; the stopped one cannot write late', async () => {
    const analysis = await createAnalysis({ runId: (await ownRun('W')).id, mode: 'sequential', requestedBy: null });

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

  it("a worker killed mid-job (SIGKILL) loses its lease: another worker's sweep puts the job back in seconds, long before the queue's expiry", { timeout: 120_000 }, async () => {
    const analysis = await createAnalysis({ runId: (await ownRun('K')).id, mode: 'sequential', requestedBy: null });
    const queue = `analysis-test-${randomBytes(4).toString('hex')}`;
    // The analysis queue's own expiry (15 minutes): only the lease can bring the job back within the test.
    const policy = { retryLimit: 3, retryDelay: 1, retryBackoff: false, expireInSeconds: 15 * 60 };

    const root = path.resolve(import.meta.dirname, '../..');
    // node itself with tsx as its loader: the tsx command would run the worker in a child process of its own, which a SIGKILL of tsx leaves running
    const child = spawn(process.execPath, ['--import', 'tsx', '--conditions=react-server', 'tests/integration/fixtures/stallingWorker.ts'], {
      cwd: root, env: { ...process.env, FRINGELOG_TEST_QUEUE: queue, FRINGELOG_TEST_POLICY: JSON.stringify(policy) }, stdio: ['ignore', 'pipe', 'inherit'],
    });
    let out = '';
    child.stdout.on('data', (b: Buffer) => (out += b.toString()));
    const exited = new Promise<NodeJS.Signals | null>((r) => child.on('exit', (_code, signal) => r(signal)));
    try {
      await until('the stalling worker to start', async () => (out.includes('waiting') ? true : undefined));
      await sendAnalysisJob(analysis.id, undefined, queue);
      await until('the stalling worker to reach the store', async () => (out.includes('at-store') ? true : undefined));
    } finally {
      child.kill('SIGKILL');
    }
    expect(await exited).toBe('SIGKILL');
    const killedAt = Date.now();
    expect((await findAnalysis(analysis.id))?.analysis).toMatchObject({ state: 'running', attempt: 1 });
    const active = await db().execute<{ state: string }>(sql`select state from pgboss.job where id = ${analysisJobId(analysis.id)}`);
    expect(active.rows[0]?.state).toBe('active');

    const events: unknown[] = [];
    const second = await startAnalysisWorker({
      queue, policy, pollingIntervalSeconds: 0.5, lease: { heartbeatSeconds: 0.5, staleAfterSeconds: 3, sweepSeconds: 0.5 }, onLeaseEvent: (e) => events.push(e),
    });
    bosses.push(second);
    const done = await until('the second worker to finish', async () => {
      const a = await findAnalysis(analysis.id);
      return a?.analysis.state === 'done' ? a : undefined;
    });
    // back within the lease (3 s stale + sweeps + the retry delay + the fit), not 15 minutes
    expect(Date.now() - killedAt).toBeLessThan(60_000);
    expect(events).toEqual([{ analysisId: analysis.id, kind: 'retried' }]);
    expect(done.analysis.attempt).toBe(2);
    expect(done.layers.map((l) => l.layer)).toEqual([1, 2, 3, 4]);
  });

  it('an analysis whose worker died on its last try is failed with a message, not left running', { timeout: 60_000 }, async () => {
    const analysis = await createAnalysis({ runId: (await ownRun('L')).id, mode: 'sequential', requestedBy: null });
    const queue = `analysis-test-${randomBytes(4).toString('hex')}`;
    const boss = await startBoss({ supervise: false, schedule: false }, queue, { retryLimit: 0, expireInSeconds: 15 * 60 });
    bosses.push(boss);
    await sendAnalysisJob(analysis.id, undefined, queue);
    // a worker takes the job and the analysis, then dies: the job stays active, the analysis running, no beat
    const [job] = await boss.fetch(queue);
    expect(job.id).toBe(analysisJobId(analysis.id));
    await db().execute(sql`update analyses set state = 'running', attempt = 1, heartbeat_at = now() - interval '1 hour' where id = ${analysis.id}`);
    const events: { kind: string }[] = [];
    const sweeper = await startAnalysisWorker({ queue, pollingIntervalSeconds: 0.5, lease: { heartbeatSeconds: 0.5, staleAfterSeconds: 1, sweepSeconds: 0.3 }, onLeaseEvent: (e) => events.push(e) });
    bosses.push(sweeper);
    const failed = await until('the analysis to fail', async () => {
      const a = await findAnalysis(analysis.id);
      return a?.analysis.state === 'failed' ? a : undefined;
    });
    expect(failed.analysis.error).toMatch(/stopped answering and the queue has no try left \(job failed after 1 try\)/);
    expect(events.map((e) => e.kind)).toEqual(['failed']);
    expect((await runAnalysisJob(analysis.id)).state).toBe('skipped');
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
    const analysis = await createAnalysis({ runId: (await ownRun('R', AR1)).id, mode: 'sequential', requestedBy: null });
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
