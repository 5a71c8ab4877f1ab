'use server';

import { after } from 'next/server';
import { issueToken, tokenIssuedSince } from '@/db/queries/tokens';
import { findUserForSignIn } from '@/db/queries/users';
import { formObject, fromZod, notAForm, ok, type ActionResult } from '@/app/_lib/errors';
import { appLink, resetMail, sendMail } from '@/app/_lib/mail';
import { resetRequestSchema } from '@/app/_lib/schemas';
import { newToken, RESET_SPACING_MS, RESET_TTL_MS } from '@/app/_lib/tokens';

/**
 * Answers at once, the same for every address; the lookup, the token and the mail happen after
 * the answer has gone, so neither the reply nor its timing tells whether the address has an account.
 */
export async function requestPasswordReset(_prev: ActionResult<{ email: string }> | null, form: FormData): Promise<ActionResult<{ email: string }>> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = resetRequestSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const { email } = parsed.data;
  after(() => sendResetLink(email));
  return ok({ email });
}

async function sendResetLink(email: string): Promise<void> {
  try {
    const user = await findUserForSignIn(email);
    if (!user || user.status !== 'active') return;
    // One mail a minute at most, so the form cannot be used to flood someone's inbox.
    if (await tokenIssuedSince(user.id, 'reset', new Date(Date.now() - RESET_SPACING_MS))) return;
    const { token, tokenHash } = newToken();
    await issueToken(user.id, 'reset', tokenHash, new Date(Date.now() + RESET_TTL_MS), { actorId: null, action: 'user.reset_requested' });
    const mail = resetMail(user.name, appLink(`/set-password?token=${token}`));
    await sendMail(user.email, mail.subject, mail.text);
  } catch (err) {
    // Nobody is waiting for this answer any more: the log is where a failed mail shows.
    console.error('[fringelog] reset mail failed:', err);
  }
}
