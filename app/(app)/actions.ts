'use server';

import { redirect } from 'next/navigation';
import { endSessions } from '@/db/queries/users';
import { getSession } from '@/app/_lib/session';

/**
 * Sign-out needs no capability: anyone may end their own session. Clearing the cookie is not
 * enough (a copy would still open pages for its 12 hours), so the user's session version moves
 * on, which ends every session of theirs, on every device. A cookie that had already ended
 * moves nothing.
 */
export async function signOut(): Promise<void> {
  const session = await getSession();
  if (session.userId && session.sessionVersion !== undefined) await endSessions(session.userId, session.sessionVersion);
  session.destroy();
  redirect('/sign-in?notice=signed-out');
}
