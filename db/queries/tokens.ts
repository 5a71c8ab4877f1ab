import 'server-only';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import { db } from '../client';
import { auditEvents, oneTimeTokens, users } from '../schema';

type Kind = 'invite' | 'reset';

/** Voids the user's open tokens of this kind and stores a new one, in one transaction. */
export async function issueToken(
  userId: number,
  kind: Kind,
  tokenHash: string,
  expiresAt: Date,
  audit?: { actorId: number | null; action: string },
): Promise<void> {
  await db().transaction(async (tx) => {
    await tx
      .update(oneTimeTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(oneTimeTokens.userId, userId), eq(oneTimeTokens.kind, kind), isNull(oneTimeTokens.usedAt)));
    await tx.insert(oneTimeTokens).values({ userId, kind, tokenHash, expiresAt });
    if (audit) {
      await tx.insert(auditEvents).values({ actorId: audit.actorId, action: audit.action, targetType: 'user', targetId: String(userId), detail: {} });
    }
  });
}

export type TokenProblem = 'unknown' | 'used' | 'expired' | 'inactive';
export type TokenCheck = { ok: true; kind: Kind; email: string; name: string } | { ok: false; problem: TokenProblem };

export async function checkToken(tokenHash: string, now = new Date()): Promise<TokenCheck> {
  const [row] = await db()
    .select({ kind: oneTimeTokens.kind, usedAt: oneTimeTokens.usedAt, expiresAt: oneTimeTokens.expiresAt, email: users.email, name: users.name, status: users.status })
    .from(oneTimeTokens)
    .innerJoin(users, eq(users.id, oneTimeTokens.userId))
    .where(eq(oneTimeTokens.tokenHash, tokenHash));
  return judge(row, now);
}

function judge(
  row: { kind: Kind; usedAt: Date | null; expiresAt: Date; email: string; name: string; status: string } | undefined,
  now: Date,
): TokenCheck {
  if (!row) return { ok: false, problem: 'unknown' };
  // Deactivation also voids open links; say why rather than "used".
  if (row.status === 'deactivated') return { ok: false, problem: 'inactive' };
  if (row.usedAt) return { ok: false, problem: 'used' };
  if (row.expiresAt.getTime() <= now.getTime()) return { ok: false, problem: 'expired' };
  if (row.kind === 'reset' && row.status !== 'active') return { ok: false, problem: 'inactive' };
  return { ok: true, kind: row.kind, email: row.email, name: row.name };
}

/**
 * Uses a token: sets the password, activates an invited user, ends other sessions and marks
 * the token used, all in one transaction (the token row is locked, so it works only once).
 */
export async function redeemToken(
  tokenHash: string,
  passwordHash: string,
  now = new Date(),
): Promise<{ ok: true; userId: number; email: string } | { ok: false; problem: TokenProblem }> {
  return db().transaction(async (tx) => {
    const [token] = await tx.select().from(oneTimeTokens).where(eq(oneTimeTokens.tokenHash, tokenHash)).for('update');
    if (!token) return { ok: false, problem: 'unknown' as const };
    const [user] = await tx.select().from(users).where(eq(users.id, token.userId)).for('update');
    const verdict = judge(user && { ...token, email: user.email, name: user.name, status: user.status }, now);
    if (!verdict.ok) return verdict;
    await tx
      .update(users)
      .set({ passwordHash, status: 'active', sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: now })
      .where(eq(users.id, token.userId));
    await tx.update(oneTimeTokens).set({ usedAt: now }).where(eq(oneTimeTokens.id, token.id));
    await tx.insert(auditEvents).values({
      actorId: token.userId,
      action: token.kind === 'invite' ? 'user.invite_accepted' : 'user.password_reset',
      targetType: 'user',
      targetId: String(token.userId),
      detail: {},
    });
    return { ok: true as const, userId: token.userId, email: user.email };
  });
}

/** Whether a token of this kind was issued for the user after `since` (to space out reset mails). */
export async function tokenIssuedSince(userId: number, kind: Kind, since: Date): Promise<boolean> {
  const [row] = await db()
    .select({ id: oneTimeTokens.id })
    .from(oneTimeTokens)
    .where(and(eq(oneTimeTokens.userId, userId), eq(oneTimeTokens.kind, kind), gt(oneTimeTokens.createdAt, since)))
    .limit(1);
  return row !== undefined;
}
