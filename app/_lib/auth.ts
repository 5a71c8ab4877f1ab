import 'server-only';
import { forbidden, redirect } from 'next/navigation';
import { cache } from 'react';
import { findUserById, type PublicUser } from '@/db/queries/users';
import { can, type Capability, type Role } from './capabilities';
import { failure } from './errors';
import { getSession } from './session';

/** The signed-in, active user whose session version is current; null otherwise. */
export const currentUser = cache(async (): Promise<PublicUser | null> => {
  const session = await getSession();
  if (!session.userId) return null;
  const user = await findUserById(session.userId);
  if (!user || user.status !== 'active' || user.sessionVersion !== session.sessionVersion) return null;
  return user;
});

/** For pages and layouts: redirects to sign-in when nobody is signed in. */
export async function requireUser(): Promise<PublicUser> {
  const user = await currentUser();
  if (!user) redirect('/sign-in');
  return user;
}

/** For pages: renders the 403 page when the role lacks the capability. */
export async function requireCapability(capability: Capability): Promise<PublicUser> {
  const user = await requireUser();
  if (!can(user.role, capability)) forbidden();
  return user;
}

/** For pages: renders the 403 page unless the user has one of the roles. */
export async function requireRole(...roles: Role[]): Promise<PublicUser> {
  const user = await requireUser();
  if (!roles.includes(user.role)) forbidden();
  return user;
}

export type Authorized = { ok: true; user: PublicUser } | ReturnType<typeof failure>;

/** For server actions and route handlers: a result instead of a redirect. */
export async function authorize(capability?: Capability): Promise<Authorized> {
  const user = await currentUser();
  if (!user) return failure('unauthorized:session');
  if (capability && !can(user.role, capability)) return failure('forbidden:role');
  return { ok: true, user };
}
