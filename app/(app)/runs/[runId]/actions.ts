'use server';

import { revalidatePath } from 'next/cache';
import type { z } from 'zod';
import { addNote, changeNote, setDisposition } from '@/db/queries/review';
import { authorize } from '@/app/_lib/auth';
import { failure, formObject, fromZod, notAForm, ok, unexpected, type ActionResult } from '@/app/_lib/errors';
import { annotationSchema, commentSchema, dispositionSchema, noteChangeSchema } from '@/app/_lib/schemas';

const page = (runId: number) => `/runs/${runId}`;

type Added = ActionResult<{ id: number }>;

async function add(kind: 'annotation' | 'comment', parsed: { success: true; data: { runId: number; body: string; timeS?: number | null; layer?: number | null } } | { success: false; error: z.ZodError }): Promise<Added> {
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('writeRunNotes');
  if (!auth.ok) return auth;
  try {
    const row = await addNote(kind, { ...parsed.data, authorId: auth.user.id });
    if (!row) return failure('not_found:run');
    revalidatePath(page(parsed.data.runId));
    return ok(row);
  } catch (err) {
    return unexpected(`add ${kind}`, err);
  }
}

/** Pins a note to a time of the run or one of its layers (operators, engineers, supervisors). */
export async function addAnnotation(_prev: Added | null, form: FormData): Promise<Added> {
  if (!(form instanceof FormData)) return notAForm();
  return add('annotation', annotationSchema.safeParse(formObject(form)));
}

/** Adds to the run's comment thread. */
export async function addComment(_prev: Added | null, form: FormData): Promise<Added> {
  if (!(form instanceof FormData)) return notAForm();
  return add('comment', commentSchema.safeParse(formObject(form)));
}

/** Edits (with a body) or deletes (without) one's own annotation or comment. */
export async function changeOwnNote(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = noteChangeSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('writeRunNotes');
  if (!auth.ok) return auth;
  const { kind, runId, noteId, body } = parsed.data;
  try {
    const changed = await changeNote(kind, { runId, noteId, authorId: auth.user.id, body: body ?? null });
    if (!changed) return failure('not_found:note');
    revalidatePath(page(runId));
    return ok(undefined);
  } catch (err) {
    return unexpected('change note', err);
  }
}

/** Sets the run's disposition with its reason (engineers and supervisors). */
export async function decideRun(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = dispositionSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('setRunDisposition');
  if (!auth.ok) return auth;
  try {
    const done = await setDisposition({ ...parsed.data, byId: auth.user.id });
    if (!done) return failure('not_found:run');
    revalidatePath(page(parsed.data.runId));
    revalidatePath('/runs');
    return ok(undefined);
  } catch (err) {
    return unexpected('set disposition', err);
  }
}
