import 'server-only';
import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { db } from '../client';
import { auditEvents, users } from '../schema';

export type AuditRow = {
  id: number;
  at: Date;
  actorName: string | null;
  actorEmail: string | null;
  action: string;
  /** The user acted on, when the target is a user. */
  targetName: string | null;
  targetType: string;
  targetId: string | null;
  detail: Record<string, unknown>;
};

export async function recordAudit(actorId: number | null, action: string, targetType: string, targetId: string | null, detail: Record<string, unknown> = {}): Promise<void> {
  await db().insert(auditEvents).values({ actorId, action, targetType, targetId, detail });
}

export async function listAudit(limit = 200): Promise<AuditRow[]> {
  const actor = alias(users, 'actor');
  const target = alias(users, 'target');
  return db()
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actorName: actor.name,
      actorEmail: actor.email,
      action: auditEvents.action,
      targetName: target.name,
      targetType: auditEvents.targetType,
      targetId: auditEvents.targetId,
      detail: auditEvents.detail,
    })
    .from(auditEvents)
    .leftJoin(actor, eq(actor.id, auditEvents.actorId))
    .leftJoin(target, and(eq(auditEvents.targetType, 'user'), eq(sql`${target.id}::text`, auditEvents.targetId)))
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(limit);
}
