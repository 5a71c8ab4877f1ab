'use server';

import { redirect } from 'next/navigation';
import { recordAttempt } from '@/db/queries/signInAttempts';
import { findUserForSignIn } from '@/db/queries/users';
import { verifyPassword } from '@/db/password';
import { failure, fieldFailure, formObject, fromZod, type ActionResult } from '@/app/_lib/errors';
import { signInSchema } from '@/app/_lib/schemas';
import { getSession } from '@/app/_lib/session';
import { lockMessage, signInThrottle } from '@/app/_lib/throttle';

// Compared against when the e-mail is unknown, so both cases take the same time.
const DUMMY_HASH = '$2b$10$DD/8g4Kor7R0j5wWdcduROnGJo53KjKk2Rp3lCEeIVcNSPChhiJhy';

export async function signIn(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  const parsed = signInSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const { email, password } = parsed.data;

  const throttle = await signInThrottle(email);
  if (throttle.locked) return failure('rate_limited:sign_in', lockMessage(throttle.retryAfterMs));

  const user = await findUserForSignIn(email);
  const matches = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !user.passwordHash || !matches) {
    await recordAttempt(email, false);
    const left = throttle.triesLeft - 1;
    return fieldFailure(
      'password',
      left > 0
        ? `E-mail or password is wrong. ${left} ${left === 1 ? 'try' : 'tries'} left before a 15-minute pause.`
        : lockMessage(15 * 60 * 1000),
    );
  }
  if (user.status !== 'active') {
    return fieldFailure('email', 'This account is deactivated. Ask an administrator to reactivate it.');
  }
  await recordAttempt(email, true);
  const session = await getSession();
  session.userId = user.id;
  session.sessionVersion = user.sessionVersion;
  await session.save();
  redirect('/');
}
