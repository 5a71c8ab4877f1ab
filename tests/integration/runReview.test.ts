import { afterAll, describe, expect, it } from 'vitest';
import { desc, eq } from 'drizzle-orm';
import { readTrace } from '@/analysis/trace';
import { closeDb, db } from '@/db/client';
import { latestAnalyses } from '@/db/queries/analyses';
import { listAnnotations, listComments } from '@/db/queries/review';
import { findRun, listRuns, traceFileChunks } from '@/db/queries/runs';
import { auditEvents, roles, type Role } from '@/db/schema';
import { addAnnotation, addComment, changeOwnNote, decideRun } from '@/app/(app)/runs/[runId]/actions';
import { GET as series } from '@/app/api/runs/[id]/series/route';
import { anonymous, form, signInDemo } from './helpers';

afterAll(async () => {
  await closeDb();
});

async function runId(code: string): Promise<number> {
  const run = (await listRuns()).find((r) => r.runCode === code);
  if (!run) throw new Error(`no demo run ${code}`);
  return run.id;
}

const writers: Role[] = ['operator', 'engineer', 'supervisor'];
const deciders: Role[] = ['engineer', 'supervisor'];

async function lastAudit(action: string) {
  const [row] = await db().select().from(auditEvents).where(eq(auditEvents.action, action)).orderBy(desc(auditEvents.id)).limit(1);
  return row;
}

describe('annotations, comments and dispositions, by role', () => {
  it('refuse a signed-out caller', async () => {
    const id = await runId('B1-0412');
    anonymous();
    expect(await addAnnotation(null, form({ runId: id, body: 'x', timeS: 10 }))).toMatchObject({ ok: false, code: 'unauthorized:session' });
    expect(await addComment(null, form({ runId: id, body: 'x' }))).toMatchObject({ ok: false, code: 'unauthorized:session' });
    expect(await decideRun(null, form({ runId: id, disposition: 'accepted', reason: 'fine' }))).toMatchObject({ ok: false, code: 'unauthorized:session' });
    expect(await changeOwnNote(null, form({ runId: id, noteId: 1, kind: 'comment' }))).toMatchObject({ ok: false, code: 'unauthorized:session' });
  });

  for (const role of roles) {
    it(`let the ${role} ${writers.includes(role) ? 'write notes' : 'only read notes'} and ${deciders.includes(role) ? 'decide' : 'not decide'} the disposition`, async () => {
      const id = await runId('B2-0588');
      await signInDemo(role);
      const a = await addAnnotation(null, form({ runId: id, body: `pinned by the ${role}`, timeS: 42.5, layer: 2 }));
      const c = await addComment(null, form({ runId: id, body: `said by the ${role}` }));
      const d = await decideRun(null, form({ runId: id, disposition: 'on_hold', reason: `held by the ${role}: check layer 2` }));
      if (writers.includes(role)) {
        expect(a.ok && c.ok).toBe(true);
        expect((await listAnnotations(id)).some((n) => n.body === `pinned by the ${role}` && n.timeS === 42.5 && n.layer === 2)).toBe(true);
        expect((await listComments(id)).some((n) => n.body === `said by the ${role}`)).toBe(true);
      } else {
        expect(a).toMatchObject({ ok: false, code: 'forbidden:role' });
        expect(c).toMatchObject({ ok: false, code: 'forbidden:role' });
      }
      if (deciders.includes(role)) {
        expect(d.ok).toBe(true);
        const { run } = (await findRun(id))!;
        expect(run).toMatchObject({ disposition: 'on_hold', dispositionReason: `held by the ${role}: check layer 2` });
        expect((await lastAudit('run.disposition_set'))?.detail).toMatchObject({ disposition: 'on_hold', runCode: 'B2-0588' });
      } else {
        expect(d).toMatchObject({ ok: false, code: 'forbidden:role' });
      }
    });
  }
});

describe('the rules of notes and dispositions', () => {
  it('need a reason and a known decision for a disposition', async () => {
    const id = await runId('B1-0413');
    await signInDemo('supervisor');
    const none = await decideRun(null, form({ runId: id, disposition: 'rejected', reason: '  ' }));
    expect(none).toMatchObject({ ok: false, code: 'bad_request:input', fieldErrors: { reason: ['Give the reason for the decision.'] } });
    expect(await decideRun(null, form({ runId: id, disposition: 'scrap', reason: 'bad' }))).toMatchObject({ ok: false, fieldErrors: { disposition: ['Choose a decision.'] } });
    expect((await findRun(id))!.run.disposition).not.toBe('scrap');
    expect(await decideRun(null, form({ runId: 999999, disposition: 'accepted', reason: 'no such run' }))).toMatchObject({ ok: false, code: 'not_found:run' });
  });

  it('pin an annotation to a time or a layer, never to nothing', async () => {
    const id = await runId('B1-0413');
    await signInDemo('operator');
    expect(await addAnnotation(null, form({ runId: id, body: 'floating', timeS: '', layer: '' }))).toMatchObject({ ok: false, fieldErrors: { timeS: ['Pin the note to a time or a layer.'] } });
    expect(await addAnnotation(null, form({ runId: id, body: 'layer only', layer: 3 }))).toMatchObject({ ok: true });
    expect(await addAnnotation(null, form({ runId: id, body: 'bad layer', layer: 0 }))).toMatchObject({ ok: false, fieldErrors: { layer: ['A layer number, 1 or more.'] } });
  });

  it('let only the author edit or delete a note, each change in the audit log with the old text', async () => {
    const id = await runId('B3-1120');
    await signInDemo('engineer');
    const added = await addComment(null, form({ runId: id, body: 'first words' }));
    if (!added.ok) throw new Error(added.message);
    const noteId = added.data.id;
    await signInDemo('supervisor');
    expect(await changeOwnNote(null, form({ runId: id, noteId, kind: 'comment', body: 'not mine' }))).toMatchObject({ ok: false, code: 'not_found:note' });
    expect(await changeOwnNote(null, form({ runId: id, noteId, kind: 'comment' }))).toMatchObject({ ok: false, code: 'not_found:note' });
    await signInDemo('engineer');
    expect(await changeOwnNote(null, form({ runId: id, noteId, kind: 'comment', body: 'second words' }))).toMatchObject({ ok: true });
    expect((await listComments(id)).find((c) => c.id === noteId)?.body).toBe('second words');
    expect((await lastAudit('run.comment_edited'))?.detail).toMatchObject({ comment: noteId, was: 'first words', now: 'second words' });
    expect(await changeOwnNote(null, form({ runId: id, noteId, kind: 'comment' }))).toMatchObject({ ok: true });
    expect((await listComments(id)).some((c) => c.id === noteId)).toBe(false);
    expect((await lastAudit('run.comment_deleted'))?.detail).toMatchObject({ comment: noteId, was: 'second words' });
  });
});

const get = (id: number | string, query = '') => series(new Request(`http://localhost/api/runs/${id}/series${query}`), { params: Promise.resolve({ id: String(id) }) });

describe('GET /api/runs/{id}/series', () => {
  it('answers 401 signed out, and to every role the decimated whole run with the model', async () => {
    const id = await runId('B1-0412');
    const refit = (await latestAnalyses(id)).refit!;
    anonymous();
    const refused = await get(id, `?analysis=${refit.analysis.id}`);
    expect(refused.status).toBe(401);
    expect(await refused.json()).toMatchObject({ error: { code: 'unauthorized:session' } });
    for (const role of roles) {
      await signInDemo(role);
      const r = await get(id, `?analysis=${refit.analysis.id}`);
      expect(r.status, role).toBe(200);
      const body = (await r.json()) as { timeS: number[]; signal: number[]; model: (number | null)[] };
      expect(body.timeS.length).toBeGreaterThan(100);
      expect(body.timeS.length).toBeLessThanOrEqual(6000);
      expect(body.model.filter((m) => m !== null).length).toBeGreaterThan(body.timeS.length / 3);
    }
  });

  it('gives a window at full resolution: every sample of the raw file in it, and a model that fits them to the stored residual', async () => {
    const id = await runId('B3-1121');
    const refit = (await latestAnalyses(id)).refit!;
    const layer = refit.layers[1];
    const from = Number(layer.detail.startTimeS);
    const to = Number(layer.detail.cutTimeS);
    await signInDemo('operator');
    const body = (await (await get(id, `?analysis=${refit.analysis.id}&from=${from}&to=${to}`)).json()) as { timeS: number[]; signal: number[]; model: number[]; decimated: boolean };
    // The raw file, read independently of the stored series.
    const trace = await readTrace(traceFileChunks(id), { fileName: 'raw' });
    const expected = Array.from(trace.timeS).filter((t) => t >= from && t <= to);
    expect(body.decimated).toBe(false);
    expect(body.timeS).toEqual(expected);
    const gain = Number(layer.detail.gain);
    const rms = Math.sqrt(body.signal.reduce((s, v, i) => s + ((v - body.model[i]) / gain) ** 2, 0) / body.signal.length);
    expect(rms / layer.residualRms).toBeGreaterThan(0.95);
    expect(rms / layer.residualRms).toBeLessThan(1.05);
  });

  it('names a bad query and answers 404 for an unknown run or another run’s analysis', async () => {
    const id = await runId('B1-0412');
    const otherAnalysis = (await latestAnalyses(await runId('B2-0587'))).refit!.analysis.id;
    await signInDemo('engineer');
    const bad = await get(id, '?from=10');
    expect(bad.status).toBe(400);
    expect(await bad.json()).toEqual({ error: { code: 'bad_request:input', message: 'from: give both from and to (seconds), or neither' } });
    expect((await get(id, '?from=20&to=10')).status).toBe(400);
    expect((await get('abc')).status).toBe(400);
    expect((await get(999999)).status).toBe(404);
    expect((await get(id, `?analysis=${otherAnalysis}`)).status).toBe(404);
  });
});
