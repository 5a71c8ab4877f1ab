'use server';

import { revalidatePath } from 'next/cache';
import { issueToken } from '@/db/queries/tokens';
import { changeUserRole, createInvitedUser, emailTaken, findUserById, setUserActive } from '@/db/queries/users';
import { authorize } from '@/app/_lib/auth';
import { failure, fieldFailure, formObject, fromZod, notAForm, ok, unexpected, type ActionResult } from '@/app/_lib/errors';
import { appLink, inviteMail, sendMail } from '@/app/_lib/mail';
import { changeRoleSchema, inviteSchema, setActiveSchema, userIdSchema } from '@/app/_lib/schemas';
import { INVITE_TTL_MS, newToken } from '@/app/_lib/tokens';

const DUPLICATE = 'A user with this e-mail address already exists.';

export async function inviteUser(_prev: ActionResult<{ userId: number }> | null, form: FormData): Promise<ActionResult<{ userId: number }>> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = inviteSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('manageUsers');
  if (!auth.ok) return auth;
  if (await emailTaken(parsed.data.email)) return fieldFailure('email', DUPLICATE);

  const { token, tokenHash } = newToken();
  let userId: number;
  try {
    const user = await createInvitedUser(auth.user.id, { ...parsed.data, tokenHash, expiresAt: new Date(Date.now() + INVITE_TTL_MS) });
    userId = user.id;
  } catch (err) {
    if (isUniqueViolation(err)) return fieldFailure('email', DUPLICATE);
    return unexpected('invite', err);
  }
  revalidatePath('/admin/users');
  const mail = inviteMail(parsed.data.name, auth.user.name, appLink(`/set-password?token=${token}`));
  try {
    await sendMail(parsed.data.email, mail.subject, mail.text);
  } catch (err) {
    console.error('[fringelog] invite mail failed:', err);
    return failure('unavailable:mail', `${parsed.data.name} is invited, but the e-mail could not be sent. Use “Send new link” to try again.`);
  }
  return ok({ userId });
}

export async function resendInvite(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = userIdSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('manageUsers');
  if (!auth.ok) return auth;
  const user = await findUserById(parsed.data.userId);
  if (!user) return failure('not_found:user');
  if (user.status !== 'invited') return failure('bad_request:input', `${user.name} has already set a password.`);
  const { token, tokenHash } = newToken();
  await issueToken(user.id, 'invite', tokenHash, new Date(Date.now() + INVITE_TTL_MS), { actorId: auth.user.id, action: 'user.invite_resent' });
  const mail = inviteMail(user.name, auth.user.name, appLink(`/set-password?token=${token}`));
  try {
    await sendMail(user.email, mail.subject, mail.text);
  } catch (err) {
    console.error('[fringelog] invite mail failed:', err);
    return failure('unavailable:mail');
  }
  return ok(undefined);
}

export async function changeRole(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = changeRoleSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('manageUsers');
  if (!auth.ok) return auth;
  const result = await changeUserRole(auth.user.id, parsed.data.userId, parsed.data.role);
  if (result === 'not_found') return failure('not_found:user');
  if (result === 'last_admin') return failure('conflict:last_admin');
  revalidatePath('/admin/users');
  return ok(undefined);
}

export async function setActive(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = setActiveSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const { active } = parsed.data;
  const auth = await authorize('manageUsers');
  if (!auth.ok) return auth;
  if (!active && parsed.data.userId === auth.user.id) return failure('bad_request:input', 'You cannot deactivate yourself.');
  const result = await setUserActive(auth.user.id, parsed.data.userId, active);
  if (result === 'not_found') return failure('not_found:user');
  if (result === 'last_admin') return failure('conflict:last_admin');
  if (result === 'never_signed_up') return failure('bad_request:input', 'This person never set a password; invite them again instead.');
  revalidatePath('/admin/users');
  return ok(undefined);
}

function isUniqueViolation(err: unknown): boolean {
  for (let e: unknown = err; e && typeof e === 'object'; e = (e as { cause?: unknown }).cause) {
    if ((e as { code?: unknown }).code === '23505') return true;
  }
  return false;
}
