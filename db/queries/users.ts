import 'server-only';
import { and, asc, eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { auditEvents, oneTimeTokens, users, type Role, type User } from '../schema';

export type PublicUser = Omit<User, 'passwordHash'>;

const publicColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  status: users.status,
  sessionVersion: users.sessionVersion,
  createdAt: users.createdAt,
  updatedAt: users.updatedAt,
};

export async function findUserById(id: number): Promise<PublicUser | undefined> {
  const [row] = await db().select(publicColumns).from(users).where(eq(users.id, id));
  return row;
}

/** With the password hash: for sign-in only. */
export async function findUserForSignIn(email: string): Promise<User | undefined> {
  const [row] = await db().select().from(users).where(sql`lower(${users.email}) = lower(${email})`);
  return row;
}

export async function findUserIdByEmail(email: string, ex: Executor = db()): Promise<number | undefined> {
  const [row] = await ex.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = lower(${email})`);
  return row?.id;
}

export async function emailTaken(email: string, ex: Executor = db()): Promise<boolean> {
  const [row] = await ex.select({ id: users.id }).from(users).where(sql`lower(${users.email}) = lower(${email})`);
  return row !== undefined;
}

export async function listUsers(): Promise<PublicUser[]> {
  return db().select(publicColumns).from(users).orderBy(asc(users.name));
}

export async function countActiveAdmins(ex: Executor = db()): Promise<number> {
  const [row] = await ex
    .select({ n: sql<number>`count(*)::int` })
    .from(users)
    .where(and(eq(users.role, 'admin'), eq(users.status, 'active')));
  return row?.n ?? 0;
}

export type InviteInput = { email: string; name: string; role: Role; tokenHash: string; expiresAt: Date };

/** Creates an invited user, the invite token and the audit entry in one transaction. */
export async function createInvitedUser(actorId: number, input: InviteInput): Promise<PublicUser> {
  return db().transaction(async (tx) => {
    const [user] = await tx
      .insert(users)
      .values({ email: input.email, name: input.name, role: input.role, status: 'invited' })
      .returning(publicColumns);
    await tx.insert(oneTimeTokens).values({ userId: user.id, kind: 'invite', tokenHash: input.tokenHash, expiresAt: input.expiresAt });
    await tx.insert(auditEvents).values({
      actorId,
      action: 'user.invited',
      targetType: 'user',
      targetId: String(user.id),
      detail: { email: user.email, role: user.role },
    });
    return user;
  });
}

/** Role change with its audit entry; refuses to demote the last active admin. */
export async function changeUserRole(actorId: number, userId: number, role: Role): Promise<'ok' | 'not_found' | 'last_admin' | 'unchanged'> {
  return db().transaction(async (tx) => {
    const [target] = await tx.select().from(users).where(eq(users.id, userId)).for('update');
    if (!target) return 'not_found';
    if (target.role === role) return 'unchanged';
    if (target.role === 'admin' && target.status === 'active' && (await countActiveAdmins(tx)) <= 1) return 'last_admin';
    await tx.update(users).set({ role, updatedAt: new Date() }).where(eq(users.id, userId));
    await tx.insert(auditEvents).values({
      actorId,
      action: 'user.role_changed',
      targetType: 'user',
      targetId: String(userId),
      detail: { email: target.email, from: target.role, to: role },
    });
    return 'ok';
  });
}

/** Deactivation ends the user's sessions (session version bump) and voids open tokens. */
export async function setUserActive(
  actorId: number,
  userId: number,
  active: boolean,
): Promise<'ok' | 'not_found' | 'last_admin' | 'unchanged' | 'never_signed_up'> {
  return db().transaction(async (tx) => {
    const [target] = await tx.select().from(users).where(eq(users.id, userId)).for('update');
    if (!target) return 'not_found';
    if (active) {
      if (target.status !== 'deactivated') return 'unchanged';
      if (!target.passwordHash) return 'never_signed_up';
    } else {
      if (target.status === 'deactivated') return 'unchanged';
      if (target.role === 'admin' && target.status === 'active' && (await countActiveAdmins(tx)) <= 1) return 'last_admin';
    }
    await tx
      .update(users)
      .set({
        status: active ? 'active' : 'deactivated',
        sessionVersion: sql`${users.sessionVersion} + 1`,
        updatedAt: new Date(),
      })
      .where(eq(users.id, userId));
    if (!active) {
      await tx
        .update(oneTimeTokens)
        .set({ usedAt: new Date() })
        .where(and(eq(oneTimeTokens.userId, userId), sql`${oneTimeTokens.usedAt} is null`));
    }
    await tx.insert(auditEvents).values({
      actorId,
      action: active ? 'user.reactivated' : 'user.deactivated',
      targetType: 'user',
      targetId: String(userId),
      detail: { email: target.email },
    });
    return 'ok';
  });
}

/**
 * Ends every session of the user by moving the session version on, but only if `fromVersion` is
 * still current: a cookie that had already ended cannot end the sessions that replaced it.
 */
export async function endSessions(userId: number, fromVersion: number): Promise<boolean> {
  const rows = await db()
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(and(eq(users.id, userId), eq(users.sessionVersion, fromVersion)))
    .returning({ id: users.id });
  return rows.length > 0;
}

/** Sets a new password hash and bumps the session version; returns the new version. */
export async function updatePassword(userId: number, passwordHash: string): Promise<number | undefined> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .update(users)
      .set({ passwordHash, sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: new Date() })
      .where(and(eq(users.id, userId), eq(users.status, 'active')))
      .returning({ sessionVersion: users.sessionVersion });
    if (!row) return undefined;
    await tx.insert(auditEvents).values({ actorId: userId, action: 'user.password_changed', targetType: 'user', targetId: String(userId), detail: {} });
    return row.sessionVersion;
  });
}
