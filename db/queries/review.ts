import 'server-only';
import { and, asc, eq } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { auditEvents, designRevisions, runAnnotations, runComments, runs, users, type Run } from '../schema';

/** Annotations and comments share their shape, their rules (the author edits or deletes their own) and their audit trail. */
type NoteKind = 'annotation' | 'comment';
const tables = { annotation: runAnnotations, comment: runComments } as const;

export type RunNote = {
  id: number;
  runId: number;
  authorId: number | null;
  authorName: string | null;
  body: string;
  createdAt: Date;
  updatedAt: Date;
  /** Annotations only. */
  timeS: number | null;
  layer: number | null;
};

async function runCodeOf(tx: Executor, runId: number): Promise<string | undefined> {
  const [row] = await tx.select({ runCode: runs.runCode }).from(runs).where(eq(runs.id, runId));
  return row?.runCode;
}

export async function listAnnotations(runId: number, ex: Executor = db()): Promise<RunNote[]> {
  const t = runAnnotations;
  return ex
    .select({ id: t.id, runId: t.runId, authorId: t.authorId, authorName: users.name, body: t.body, createdAt: t.createdAt, updatedAt: t.updatedAt, timeS: t.timeS, layer: t.layer })
    .from(t)
    .leftJoin(users, eq(users.id, t.authorId))
    .where(eq(t.runId, runId))
    .orderBy(asc(t.timeS), asc(t.layer), asc(t.id));
}

export async function listComments(runId: number, ex: Executor = db()): Promise<RunNote[]> {
  const t = runComments;
  const rows = await ex
    .select({ id: t.id, runId: t.runId, authorId: t.authorId, authorName: users.name, body: t.body, createdAt: t.createdAt, updatedAt: t.updatedAt })
    .from(t)
    .leftJoin(users, eq(users.id, t.authorId))
    .where(eq(t.runId, runId))
    .orderBy(asc(t.createdAt), asc(t.id));
  return rows.map((r) => ({ ...r, timeS: null, layer: null }));
}

/** Adds a note to a run, with its audit entry; undefined when the run does not exist. */
export async function addNote(
  kind: NoteKind,
  input: { runId: number; authorId: number; body: string; timeS?: number | null; layer?: number | null },
  ex: Executor = db(),
): Promise<{ id: number } | undefined> {
  return ex.transaction(async (tx) => {
    const runCode = await runCodeOf(tx, input.runId);
    if (runCode === undefined) return undefined;
    const pin = kind === 'annotation' ? { timeS: input.timeS ?? null, layer: input.layer ?? null } : {};
    const [row] = await tx
      .insert(tables[kind])
      .values({ runId: input.runId, authorId: input.authorId, body: input.body, ...pin })
      .returning({ id: tables[kind].id });
    await tx.insert(auditEvents).values({
      actorId: input.authorId, action: `run.${kind}_added`, targetType: 'run', targetId: String(input.runId),
      detail: { runCode, [kind]: row.id, body: input.body, ...pin },
    });
    return row;
  });
}

/**
 * Changes or removes a note, only when authorId wrote it (the author is in the WHERE); the old
 * text goes to the audit log. False when there is no such note of that author on that run.
 */
export async function changeNote(
  kind: NoteKind,
  input: { runId: number; noteId: number; authorId: number; body: string | null },
  ex: Executor = db(),
): Promise<boolean> {
  const t = tables[kind];
  return ex.transaction(async (tx) => {
    const mine = and(eq(t.id, input.noteId), eq(t.runId, input.runId), eq(t.authorId, input.authorId));
    const [before] = await tx.select({ body: t.body }).from(t).where(mine).for('update');
    if (!before) return false;
    if (input.body === null) await tx.delete(t).where(mine);
    else await tx.update(t).set({ body: input.body, updatedAt: new Date() }).where(mine);
    await tx.insert(auditEvents).values({
      actorId: input.authorId, action: `run.${kind}_${input.body === null ? 'deleted' : 'edited'}`, targetType: 'run', targetId: String(input.runId),
      detail: { runCode: await runCodeOf(tx, input.runId), [kind]: input.noteId, was: before.body, ...(input.body === null ? {} : { now: input.body }) },
    });
    return true;
  });
}

export type Disposition = NonNullable<Run['disposition']>;

/** Sets a run's disposition with its reason, by whom and when, and audits it (the previous one kept in the entry). */
export async function setDisposition(input: { runId: number; disposition: Disposition; reason: string; byId: number }, ex: Executor = db()): Promise<boolean> {
  return ex.transaction(async (tx) => {
    const [before] = await tx.select({ runCode: runs.runCode, disposition: runs.disposition, reason: runs.dispositionReason }).from(runs).where(eq(runs.id, input.runId)).for('update');
    if (!before) return false;
    await tx
      .update(runs)
      .set({ disposition: input.disposition, dispositionReason: input.reason, dispositionBy: input.byId, dispositionAt: new Date() })
      .where(eq(runs.id, input.runId));
    await tx.insert(auditEvents).values({
      actorId: input.byId, action: 'run.disposition_set', targetType: 'run', targetId: String(input.runId),
      detail: { runCode: before.runCode, disposition: input.disposition, reason: input.reason, ...(before.disposition ? { was: before.disposition, wasReason: before.reason } : {}) },
    });
    return true;
  });
}

/** Who set the run's disposition, by name. */
export async function dispositionAuthor(userId: number | null, ex: Executor = db()): Promise<string | null> {
  if (userId === null) return null;
  const [row] = await ex.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return row?.name ?? null;
}

/** The design document (as stored with its revision) a run was made with. */
export async function runDesignDocument(runId: number, ex: Executor = db()): Promise<{ document: unknown; fileName: string | null } | undefined> {
  const [row] = await ex
    .select({ document: designRevisions.document, fileName: designRevisions.sourceFileName })
    .from(runs)
    .innerJoin(designRevisions, eq(designRevisions.id, runs.designRevisionId))
    .where(eq(runs.id, runId));
  return row;
}
