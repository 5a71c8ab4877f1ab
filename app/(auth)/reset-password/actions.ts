'use server';

import { issueToken, tokenIssuedSince } from '@/db/queries/tokens';
import { findUserForSignIn } from '@/db/queries/users';
import { failure, formObject, fromZod, ok, type ActionResult } from '@/app/_lib/errors';
import { appLink, resetMail, sendMail } from '@/app/_lib/mail';
import { resetRequestSchema } from '@/app/_lib/schemas';
import { newToken, RESET_SPACING_MS, RESET_TTL_MS } from '@/app/_lib/tokens';

export async function requestPasswordReset(_prev: ActionResult<{ email: string }> | null, form: FormData): Promise<ActionResult<{ email: string }>> {
  const parsed = resetRequestSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const { email } = parsed.data;
  const user = await findUserForSignIn(email);
  // The answer is the same whether or not the address has an account.
  if (!user || user.status !== 'active') return ok({ email });
  // One mail a minute at most, so the form cannot be used to flood someone's inbox.
  if (await tokenIssuedSince(user.id, 'reset', new Date(Date.now() - RESET_SPACING_MS))) return ok({ email });
  const { token, tokenHash } = newToken();
  await issueToken(user.id, 'reset', tokenHash, new Date(Date.now() + RESET_TTL_MS), { actorId: null, action: 'user.reset_requested' });
  const mail = resetMail(user.name, appLink(`/set-password?token=${token}`));
  try {
    await sendMail(user.email, mail.subject, mail.text);
  } catch (err) {
    console.error('[fringelog] reset mail failed:', err);
    return failure('unavailable:mail', 'The reset e-mail could not be sent. Try again in a minute or ask an administrator.');
  }
  return ok({ email });
}
