'use server';

import { redirect } from 'next/navigation';
import { getSession } from '@/app/_lib/session';

/** Sign-out needs no capability: anyone may end their own session. */
export async function signOut(): Promise<void> {
  const session = await getSession();
  session.destroy();
  redirect('/sign-in?notice=signed-out');
}
