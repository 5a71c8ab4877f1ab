'use server';

import { redirect } from 'next/navigation';
import { findUserForSignIn } from '@/db/queries/users';
import { verifyPassword } from '@/db/password';
import { failure, fieldFailure, formObject, fromZod, notAForm, type ActionResult } from '@/app/_lib/errors';
import { signInSchema } from '@/app/_lib/schemas';
import { getSession } from '@/app/_lib/session';
import { takeGuess, wrongGuessMessage } from '@/app/_lib/throttle';

// Compared against when the e-mail is unknown, so both cases take the same time.
const DUMMY_HASH = '$2b$10$DD/8g4Kor7R0j5wWdcduROnGJo53KjKk2Rp3lCEeIVcNSPChhiJhy';

export async function signIn(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = signInSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const { email, password } = parsed.data;

  const guess = await takeGuess(email);
  if (!guess.allowed) return failure('rate_limited:sign_in', guess.message);

  const user = await findUserForSignIn(email);
  const matches = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !user.passwordHash || !matches) {
    return fieldFailure('password', wrongGuessMessage('E-mail or password is wrong.', guess.triesLeft));
  }
  await guess.succeeded();
  if (user.status !== 'active') {
    return fieldFailure('email', 'This account is deactivated. Ask an administrator to reactivate it.');
  }
  const session = await getSession();
  session.userId = user.id;
  session.sessionVersion = user.sessionVersion;
  await session.save();
  redirect('/');
}
