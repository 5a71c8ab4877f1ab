import 'server-only';
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, isNull, lt, or, sql } from 'drizzle-orm';
import { db } from '../client';
import { auditEvents, chamberTokens, chambers, users, type ChamberToken } from '../schema';

export type ChamberTokenRow = Omit<ChamberToken, 'tokenHash'> & { chamberName: string; createdByName: string | null };

/** Every token, live ones first, newest first (never the hashes). */
export async function listChamberTokens(): Promise<ChamberTokenRow[]> {
  return db()
    .select({
      id: chamberTokens.id,
      chamberId: chamberTokens.chamberId,
      label: chamberTokens.label,
      hint: chamberTokens.hint,
      createdBy: chamberTokens.createdBy,
      createdAt: chamberTokens.createdAt,
      lastUsedAt: chamberTokens.lastUsedAt,
      revokedAt: chamberTokens.revokedAt,
      revokedBy: chamberTokens.revokedBy,
      chamberName: chambers.name,
      createdByName: users.name,
    })
    .from(chamberTokens)
    .innerJoin(chambers, eq(chambers.id, chamberTokens.chamberId))
    .leftJoin(users, eq(users.id, chamberTokens.createdBy))
    .orderBy(sql`${chamberTokens.revokedAt} is not null`, desc(chamberTokens.id));
}

/** Stores a new token's hash, with the audit entry, in one transaction. */
export async function createChamberToken(input: { chamberId: number; label: string; tokenHash: string; hint: string; createdBy: number | null }): Promise<ChamberToken> {
  return db().transaction(async (tx) => {
    const [row] = await tx.insert(chamberTokens).values(input).returning();
    await tx.insert(auditEvents).values({
      actorId: input.createdBy,
      action: 'chamber_token.created',
      targetType: 'chamber_token',
      targetId: String(row.id),
      detail: { chamberId: input.chamberId, label: input.label, hint: input.hint },
    });
    return row;
  });
}

/** Revokes a live token (false when unknown or already revoked), with the audit entry. */
export async function revokeChamberToken(id: number, actorId: number | null): Promise<boolean> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .update(chamberTokens)
      .set({ revokedAt: new Date(), revokedBy: actorId })
      .where(and(eq(chamberTokens.id, id), isNull(chamberTokens.revokedAt)))
      .returning();
    if (!row) return false;
    await tx.insert(auditEvents).values({
      actorId,
      action: 'chamber_token.revoked',
      targetType: 'chamber_token',
      targetId: String(id),
      detail: { chamberId: row.chamberId, label: row.label, hint: row.hint },
    });
    return true;
  });
}

export type TokenHolder = { tokenId: number; chamberId: number; chamberName: string };

/** The live token with this hash, and its chamber. */
export async function findLiveChamberToken(tokenHash: string): Promise<TokenHolder | undefined> {
  const [row] = await db()
    .select({ tokenId: chamberTokens.id, chamberId: chamberTokens.chamberId, chamberName: chambers.name })
    .from(chamberTokens)
    .innerJoin(chambers, eq(chambers.id, chamberTokens.chamberId))
    .where(and(eq(chamberTokens.tokenHash, tokenHash), isNull(chamberTokens.revokedAt)));
  return row;
}

/** Records a use, at most once a minute (one small write, not one per request). */
export async function touchChamberToken(id: number, now = new Date()): Promise<void> {
  const minuteAgo = new Date(now.getTime() - 60_000);
  await db()
    .update(chamberTokens)
    .set({ lastUsedAt: now })
    .where(and(eq(chamberTokens.id, id), or(isNull(chamberTokens.lastUsedAt), lt(chamberTokens.lastUsedAt, minuteAgo))));
}

/** The stored form of a chamber token (app/_lib/chamberTokens makes them). */
export function chamberTokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** Makes sure a live token with exactly this value exists for the first chamber (FRINGELOG_DEMO_TOKEN). */
export async function ensureDemoChamberToken(token: string): Promise<void> {
  if (!token.startsWith('flk_') || token.length < 20) throw new Error('FRINGELOG_DEMO_TOKEN must start with "flk_" and be at least 20 characters');
  const tokenHash = chamberTokenHash(token);
  const hint = `flk_…${token.slice(-4)}`;
  await db().transaction(async (tx) => {
    const [exists] = await tx.select({ id: chamberTokens.id }).from(chamberTokens).where(eq(chamberTokens.tokenHash, tokenHash));
    if (exists) {
      await tx.update(chamberTokens).set({ revokedAt: null, revokedBy: null }).where(eq(chamberTokens.id, exists.id));
      return;
    }
    const [first] = await tx.select({ id: chambers.id }).from(chambers).orderBy(asc(chambers.id)).limit(1);
    if (!first) throw new Error('FRINGELOG_DEMO_TOKEN is set but there is no chamber to give it to');
    const [row] = await tx.insert(chamberTokens).values({ chamberId: first.id, label: 'Demo token (FRINGELOG_DEMO_TOKEN)', tokenHash, hint }).returning({ id: chamberTokens.id });
    await tx.insert(auditEvents).values({ actorId: null, action: 'chamber_token.created', targetType: 'chamber_token', targetId: String(row.id), detail: { chamberId: first.id, demo: true, hint } });
  });
}
