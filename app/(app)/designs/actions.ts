'use server';

import { redirect } from 'next/navigation';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { findDesignWithRevisions } from '@/db/queries/designs';
import { authorize } from '@/app/_lib/auth';
import { MAX_JSON_BYTES } from '@/app/_lib/apiResponse';
import { saveDesignRevision } from '@/app/_lib/designService';
import { idField } from '@/app/_lib/schemas';
import { failure, fieldFailure, fromZod, notAForm, type ActionResult } from '@/app/_lib/errors';

const saveSchema = z.object({
  designId: idField,
  document: z.string().min(2, 'The design is empty.').max(MAX_JSON_BYTES, 'The design is too large.'),
});

/** The editor's save: the document as JSON, stored as the design's next revision. */
export async function saveDesign(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = saveSchema.safeParse({ designId: form.get('designId'), document: form.get('document') });
  if (!parsed.success) return fromZod(parsed.error);
  let document: unknown;
  try {
    document = JSON.parse(parsed.data.document);
  } catch {
    return failure('bad_request:json');
  }
  const auth = await authorize('editDesigns');
  if (!auth.ok) return auth;
  const design = await findDesignWithRevisions(parsed.data.designId);
  if (!design) return failure('not_found:design');
  const saved = await saveDesignRevision(document, auth.user.id, { name: design.name, via: 'edited' });
  if (!saved.ok) return saved;
  revalidatePath('/designs');
  redirect(`/designs/${design.id}?revision=${saved.data.revision}`);
}

/** Import of a design file from the browser: a new design, or the next revision of the one of that name. */
export async function importDesign(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const file = form.get('file');
  if (!(file instanceof File) || file.size === 0) return fieldFailure('file', 'Choose a design file (.json).');
  if (file.size > MAX_JSON_BYTES) return fieldFailure('file', `${file.name}: larger than ${MAX_JSON_BYTES / 1024 / 1024} MB.`);
  let document: unknown;
  try {
    document = JSON.parse(await file.text());
  } catch (e) {
    return fieldFailure('file', `${file.name}: not valid JSON (${(e as Error).message}).`);
  }
  const auth = await authorize('editDesigns');
  if (!auth.ok) return auth;
  const saved = await saveDesignRevision(document, auth.user.id, { via: 'imported', fileName: file.name });
  if (!saved.ok) return saved.fieldErrors ? fieldFailure('file', saved.message) : saved;
  revalidatePath('/designs');
  redirect(`/designs/${saved.data.designId}?revision=${saved.data.revision}`);
}
