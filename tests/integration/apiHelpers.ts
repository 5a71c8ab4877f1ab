import fs from 'node:fs';
import path from 'node:path';
import { expect } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from '@/db/client';
import { createChamberToken } from '@/db/queries/chamberTokens';
import { findChamberByName } from '@/db/queries/chambers';
import { sampleTracesDir } from '@/db/seed/sampleRuns';
import { newChamberToken } from '@/app/_lib/chamberTokens';
import { GET as getAnalysis } from '@/app/api/analyses/[id]/route';

export const AR1 = 'Larkspur LK-AR1 single-layer MgF2 antireflection on crown glass';
export const BAY1 = 'Bay 1 e-beam';
export const BAY2 = 'Bay 2 IAD';
export const sample = (file: string) => fs.readFileSync(path.join(sampleTracesDir, file));

let n = 0;
export const uniqueCode = (prefix = 'U') => `${prefix}-${Date.now().toString(36)}-${++n}`;

/** A multipart POST to /api/runs, as a browser or curl sends it. */
export function uploadRequest(fields: Record<string, string>, file?: { name: string; bytes: Buffer | string; type?: string }, headers: Record<string, string> = {}): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  if (file) form.set('trace', new Blob([typeof file.bytes === 'string' ? file.bytes : new Uint8Array(file.bytes)], { type: file.type ?? 'text/csv' }), file.name);
  return new Request('http://localhost/api/runs', { method: 'POST', body: form, headers });
}

export function getRequest(url: string, headers: Record<string, string> = {}): Request {
  return new Request(`http://localhost${url}`, { headers });
}

export const params = (id: string | number) => ({ params: Promise.resolve({ id: String(id) }) });

export async function chamberToken(chamber: string): Promise<{ token: string; id: number; auth: Record<string, string> }> {
  const c = await findChamberByName(chamber);
  const t = newChamberToken();
  const row = await createChamberToken({ chamberId: c!.id, label: `test ${chamber}`, tokenHash: t.tokenHash, hint: t.hint, createdBy: null });
  return { token: t.token, id: row.id, auth: { authorization: `Bearer ${t.token}` } };
}

/** Row counts of everything an upload writes, to prove a refused one wrote nothing. */
export async function storedCounts(): Promise<Record<string, number>> {
  const r = await db().execute<{ runs: string; files: string; chunks: string; analyses: string; jobs: string; audits: string }>(sql`
    select (select count(*) from runs) as runs, (select count(*) from trace_files) as files, (select count(*) from trace_file_chunks) as chunks,
           (select count(*) from analyses) as analyses, (select count(*) from pgboss.job) as jobs,
           (select count(*) from audit_events where action = 'run.uploaded') as audits`);
  return Object.fromEntries(Object.entries(r.rows[0]).map(([k, v]) => [k, Number(v)]));
}

export async function errorOf(res: Response, status: number) {
  const body = (await res.json()) as { error: { code: string; message: string; line?: number; column?: number; field?: string } };
  expect(res.status, JSON.stringify(body)).toBe(status);
  expect(Object.keys(body)).toEqual(['error']);
  expect(typeof body.error.code).toBe('string');
  expect(typeof body.error.message).toBe('string');
  return body.error;
}

/** Polls GET /api/analyses/{id} (bounded) until it is done or failed; the worker `npm test` starts does the work. */
export async function waitForAnalysis(id: string, headers: Record<string, string> = {}, timeoutMs = 90_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const body = (await (await getAnalysis(getRequest(`/api/analyses/${id}`, headers), params(id))).json()) as { state: string; error?: string; result?: { layers: unknown[] } };
    if (body.state === 'done' || body.state === 'failed') return body;
    if (Date.now() > deadline) throw new Error(`analysis ${id} still ${body.state} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}
