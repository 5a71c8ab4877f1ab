'use server';

import { verifyPassword, hashPassword } from '@/db/password';
import { findUserForSignIn, updatePassword } from '@/db/queries/users';
import { authorize } from '@/app/_lib/auth';
import { failure, fieldFailure, formObject, fromZod, notAForm, ok, type ActionResult } from '@/app/_lib/errors';
import { alertPreferencesSchema, changePasswordSchema } from '@/app/_lib/schemas';
import { saveAlertPreferences as storeAlertPreferences } from '@/db/queries/alerts';
import { getSession } from '@/app/_lib/session';
import { takeGuess, wrongGuessMessage } from '@/app/_lib/throttle';

/**
 * Changes the caller's password; every other session of theirs ends, this one stays. A wrong
 * current password is a guess like a wrong sign-in: it counts toward the same pause.
 */
export async function changePassword(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = changePasswordSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('changeOwnPassword');
  if (!auth.ok) return auth;
  const guess = await takeGuess(auth.user.email);
  if (!guess.allowed) return failure('rate_limited:sign_in', guess.message, { current: [guess.message] });
  const full = await findUserForSignIn(auth.user.email);
  if (!full?.passwordHash || !(await verifyPassword(parsed.data.current, full.passwordHash))) {
    return fieldFailure('current', wrongGuessMessage('That is not your current password.', guess.triesLeft));
  }
  await guess.succeeded();
  const version = await updatePassword(auth.user.id, await hashPassword(parsed.data.password));
  if (version === undefined) return failure('unauthorized:session');
  const session = await getSession();
  session.sessionVersion = version;
  await session.save();
  return ok(undefined);
}

/** Saves which alert e-mails the caller wants (engineers and supervisors). */
export async function saveAlertPreferences(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = alertPreferencesSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('receiveToleranceAlerts');
  if (!auth.ok) return auth;
  await storeAlertPreferences(auth.user.id, parsed.data);
  return ok(undefined);
}
