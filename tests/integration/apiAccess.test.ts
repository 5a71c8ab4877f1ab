import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { closeDb, db } from '@/db/client';
import { stopSenderBoss } from '@/db/jobs/queue';
import { roles, type Role } from '@/db/schema';
import { GET as listRuns, POST as upload } from '@/app/api/runs/route';
import { GET as getRun } from '@/app/api/runs/[id]/route';
import { GET as getTrace } from '@/app/api/runs/[id]/trace/route';
import { GET as getCsv } from '@/app/api/runs/[id]/results.csv/route';
import { POST as reanalyse } from '@/app/api/runs/[id]/analyses/route';
import { GET as getAnalysis } from '@/app/api/analyses/[id]/route';
import UploadPage from '@/app/(app)/runs/upload/page';
import ChamberTokensPage from '@/app/(app)/admin/chamber-tokens/page';
import { createChamberTokenAction, revokeChamberTokenAction } from '@/app/(app)/admin/chamber-tokens/actions';
import { findChamberByName } from '@/db/queries/chambers';
import { latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { analyseStoredRun } from '@/db/jobs/analyseStoredRun';
import { readTrace } from '@/analysis/trace';
import { AR1, BAY1, BAY2, chamberToken, getRequest, params, sample, uniqueCode, uploadRequest } from './apiHelpers';
import { anonymous, form, interruptOf, signInDemo } from './helpers';

afterAll(async () => {
  await stopSenderBoss();
  await closeDb();
});

type Who = Role | 'anonymous' | 'token (own chamber)' | 'token (other chamber)';
const everyone: Who[] = ['anonymous', ...roles, 'token (own chamber)', 'token (other chamber)'];

/** Signs in (or not) as `who`; returns the headers a request carries (a token's Authorization). */
async function as(who: Who): Promise<Record<string, string>> {
  anonymous();
  if (who === 'token (own chamber)') return (await chamberToken(BAY1)).auth;
  if (who === 'token (other chamber)') return (await chamberToken(BAY2)).auth;
  if (who !== 'anonymous') await signInDemo(who);
  return {};
}

let own: { runId: number; analysisId: number } | undefined;

/** A Bay 1 run of this file's own, analysed (the re-analyses queued here must not touch the demo runs). */
async function b1Run(): Promise<{ runId: number; analysisId: number }> {
  if (own) return own;
  const bytes = sample('bay1-ar1-run0412.csv');
  const trace = await readTrace([bytes], { fileName: 'bay1-ar1-run0412.csv' });
  const [revision, chamber] = await Promise.all([latestDesignRevision(AR1), findChamberByName(BAY1)]);
  const { run } = await createRunWithTrace({
    designRevisionId: revision!.id,
    chamberId: chamber!.id,
    runCode: uniqueCode('ACL'),
    uploadedBy: null,
    trace: { fileName: 'bay1-ar1-run0412.csv', bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
  const done = await analyseStoredRun(run.id, 'sequential');
  own = { runId: run.id, analysisId: done.analysisId };
  return own;
}

/** The expected status of each caller, in the order of `everyone`. */
const matrix: { route: string; expect: number[]; call: (h: Record<string, string>, ids: { runId: number; analysisId: number }) => Promise<Response> }[] = [
  { route: 'GET /api/runs', expect: [401, 200, 200, 200, 200, 200, 200], call: (h) => listRuns(getRequest('/api/runs', h)) },
  { route: 'GET /api/runs/{id}', expect: [401, 200, 200, 200, 200, 200, 403], call: (h, i) => getRun(getRequest(`/api/runs/${i.runId}`, h), params(i.runId)) },
  { route: 'GET /api/runs/{id}/trace', expect: [401, 200, 200, 200, 200, 200, 403], call: (h, i) => getTrace(getRequest(`/api/runs/${i.runId}/trace`, h), params(i.runId)) },
  { route: 'GET /api/runs/{id}/results.csv', expect: [401, 200, 200, 200, 200, 200, 403], call: (h, i) => getCsv(getRequest(`/api/runs/${i.runId}/results.csv`, h), params(i.runId)) },
  { route: 'GET /api/analyses/{id}', expect: [401, 200, 200, 200, 200, 200, 403], call: (h, i) => getAnalysis(getRequest(`/api/analyses/${i.analysisId}`, h), params(i.analysisId)) },
  {
    route: 'POST /api/runs/{id}/analyses',
    expect: [401, 403, 201, 403, 201, 403, 403],
    call: (h, i) => reanalyse(new Request(`http://localhost/api/runs/${i.runId}/analyses`, { method: 'POST', body: JSON.stringify({ mode: 'sequential', heldIndex: 'nominal' }), headers: { ...h, 'content-type': 'application/json' } }), params(i.runId)),
  },
  {
    route: 'POST /api/runs (a Bay 1 trace)',
    expect: [401, 201, 201, 201, 201, 201, 403],
    call: (h) => upload(uploadRequest({ design: AR1, runCode: uniqueCode('ACL') }, { name: 'bay1-ar1-run0412.csv', bytes: sample('bay1-ar1-run0412.csv') }, h)),
  },
];

describe('who may call each new route', () => {
  for (const row of matrix) {
    it(`${row.route}: ${everyone.map((w, i) => `${w} ${row.expect[i]}`).join(', ')}`, async () => {
      const ids = await b1Run();
      const got: number[] = [];
      for (const who of everyone) got.push((await row.call(await as(who), ids)).status);
      expect(got).toEqual(row.expect);
    });
  }

  it('an unknown run or analysis is a 404 for whoever may read runs', async () => {
    await signInDemo('operator');
    expect((await getRun(getRequest('/api/runs/99999999'), params(99999999))).status).toBe(404);
    expect((await getRun(getRequest('/api/runs/abc'), params('abc'))).status).toBe(404);
    expect((await getAnalysis(getRequest('/api/analyses/99999999'), params(99999999))).status).toBe(404);
  });

  it('bad settings for a re-analysis are a 400 naming the key', async () => {
    await signInDemo('engineer');
    const { runId } = await b1Run();
    const res = await reanalyse(new Request(`http://localhost/api/runs/${runId}/analyses`, { method: 'POST', body: JSON.stringify({ mode: 'sequential', offset: true }), headers: { 'content-type': 'application/json' } }), params(runId));
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: { message: string } }).error.message).toContain('offset');
  });
});

describe('the upload and chamber-token pages and actions', () => {
  it('the upload page: every role; signed out goes to sign-in', async () => {
    anonymous();
    expect(await interruptOf(() => UploadPage())).toEqual({ kind: 'redirect', location: '/sign-in' });
    for (const role of roles) {
      await signInDemo(role);
      expect(await interruptOf(() => UploadPage()), role).toBe('returned');
    }
  });

  it('the chamber-token page and its actions: admins only; a created token is audited, revoked once', async () => {
    anonymous();
    expect(await interruptOf(() => ChamberTokensPage())).toEqual({ kind: 'redirect', location: '/sign-in' });
    const chamber = await findChamberByName(BAY1);
    for (const role of ['operator', 'engineer', 'supervisor'] as const) {
      await signInDemo(role);
      expect(await interruptOf(() => ChamberTokensPage()), role).toEqual({ kind: 'http', status: 403 });
      expect(await createChamberTokenAction(null, form({ chamberId: chamber!.id, label: 'not allowed' }))).toMatchObject({ ok: false, code: 'forbidden:role' });
      expect(await revokeChamberTokenAction(null, form({ tokenId: 1 }))).toMatchObject({ ok: false, code: 'forbidden:role' });
    }
    await signInDemo('admin');
    expect(await interruptOf(() => ChamberTokensPage())).toBe('returned');
    expect(await createChamberTokenAction(null, form({ chamberId: chamber!.id, label: '' }))).toMatchObject({ ok: false, fieldErrors: { label: [expect.any(String)] } });
    const created = await createChamberTokenAction(null, form({ chamberId: chamber!.id, label: 'Bay 1 controller PC' }));
    if (!created.ok) throw new Error(created.message);
    expect(created.data.token).toMatch(/^flk_[A-Za-z0-9_-]{43}$/);
    const stored = await db().execute<{ id: number; token_hash: string; hint: string }>(sql`select id, token_hash, hint from chamber_tokens where hint = ${created.data.hint} order by id desc limit 1`);
    expect(stored.rows[0].token_hash).not.toContain(created.data.token.slice(4));
    const tokenId = stored.rows[0].id;
    const audit = await db().execute<{ action: string }>(sql`select action from audit_events where target_type = 'chamber_token' and target_id = ${String(tokenId)}`);
    expect(audit.rows.map((r) => r.action)).toEqual(['chamber_token.created']);
    const auth = { authorization: `Bearer ${created.data.token}` };
    expect((await listRuns(getRequest('/api/runs', auth))).status).toBe(200);
    const used = await db().execute<{ last_used_at: Date | null }>(sql`select last_used_at from chamber_tokens where id = ${tokenId}`);
    expect(used.rows[0].last_used_at).not.toBeNull();
    expect(await revokeChamberTokenAction(null, form({ tokenId }))).toEqual({ ok: true, data: undefined });
    expect(await revokeChamberTokenAction(null, form({ tokenId }))).toMatchObject({ ok: false, code: 'not_found:token' });
    expect((await listRuns(getRequest('/api/runs', auth))).status).toBe(401);
  });
});
