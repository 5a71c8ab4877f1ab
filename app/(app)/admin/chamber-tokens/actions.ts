'use server';

import { revalidatePath } from 'next/cache';
import { createChamberToken, revokeChamberToken } from '@/db/queries/chamberTokens';
import { findChamberById } from '@/db/queries/chambers';
import { authorize } from '@/app/_lib/auth';
import { newChamberToken } from '@/app/_lib/chamberTokens';
import { failure, fieldFailure, formObject, fromZod, notAForm, ok, type ActionResult } from '@/app/_lib/errors';
import { chamberTokenIdSchema, createChamberTokenSchema } from '@/app/_lib/schemas';

export type CreatedToken = { token: string; hint: string; chamberName: string; label: string };

/** Creates a chamber token; the token itself is in this result only (it is stored as a hash). */
export async function createChamberTokenAction(_prev: ActionResult<CreatedToken> | null, form: FormData): Promise<ActionResult<CreatedToken>> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = createChamberTokenSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('manageChamberTokens');
  if (!auth.ok) return auth;
  const chamber = await findChamberById(parsed.data.chamberId);
  if (!chamber) return fieldFailure('chamberId', 'Choose a chamber.');
  const { token, tokenHash, hint } = newChamberToken();
  await createChamberToken({ chamberId: chamber.id, label: parsed.data.label, tokenHash, hint, createdBy: auth.user.id });
  revalidatePath('/admin/chamber-tokens');
  return ok({ token, hint, chamberName: chamber.name, label: parsed.data.label });
}

export async function revokeChamberTokenAction(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = chamberTokenIdSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('manageChamberTokens');
  if (!auth.ok) return auth;
  if (!(await revokeChamberToken(parsed.data.tokenId, auth.user.id))) return failure('not_found:token');
  revalidatePath('/admin/chamber-tokens');
  return ok(undefined);
}
