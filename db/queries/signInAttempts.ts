import 'server-only';
import { eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { signInAttempts } from '../schema';

export type AttemptLimits = {
  /** Failed guesses in a row for one e-mail address before it pauses. */
  perEmail: number;
  /** Failed guesses from one client address, whatever the e-mail, before it pauses. */
  perClient: number;
  windowMs: number;
};

export type Reservation =
  | { ok: true; attemptId: number; triesLeft: number }
  | { ok: false; scope: 'email' | 'client'; retryAfterMs: number };

/** Serialises everything done under this key until the transaction ends. */
async function lockKey(tx: Executor, key: string): Promise<void> {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${key}, 0))`);
}

/**
 * Checks the limits and records the attempt as a failure in one transaction, under an advisory
 * lock per e-mail and per client, so simultaneous guesses queue and at most `perEmail` of them
 * are ever let through in the window. The caller verifies the password only after this, and
 * marks the attempt succeeded when it was right. Times come from the database clock
 * (clock_timestamp: after the lock is held), so the wait is never stated longer than the window.
 */
export async function reserveAttempt(emailAddress: string, client: string, limits: AttemptLimits): Promise<Reservation> {
  const email = emailAddress.toLowerCase();
  const windowS = limits.windowMs / 1000;
  return db().transaction(async (tx) => {
    // Always the client first, then the e-mail: one order, so two transactions never wait on each other.
    await lockKey(tx, `sign-in client ${client}`);
    await lockKey(tx, `sign-in email ${email}`);
    const byClient = await tx.execute<{ n: number; retry_ms: number | null }>(sql`
      select count(*)::int as n,
             extract(epoch from (max(at) + make_interval(secs => ${windowS}) - clock_timestamp())) * 1000 as retry_ms
      from ${signInAttempts}
      where client = ${client} and not succeeded and at > clock_timestamp() - make_interval(secs => ${windowS})`);
    const c = byClient.rows[0];
    if (c && c.n >= limits.perClient) return { ok: false as const, scope: 'client' as const, retryAfterMs: Number(c.retry_ms ?? 0) };
    const byEmail = await tx.execute<{ n: number; retry_ms: number | null }>(sql`
      select count(*)::int as n,
             extract(epoch from (max(at) + make_interval(secs => ${windowS}) - clock_timestamp())) * 1000 as retry_ms
      from ${signInAttempts}
      where email = ${email} and not succeeded and at > clock_timestamp() - make_interval(secs => ${windowS})
        and at > coalesce((select max(at) from ${signInAttempts} where email = ${email} and succeeded), '-infinity')`);
    const e = byEmail.rows[0];
    const failures = e?.n ?? 0;
    if (failures >= limits.perEmail) return { ok: false as const, scope: 'email' as const, retryAfterMs: Number(e?.retry_ms ?? 0) };
    const [row] = await tx
      .insert(signInAttempts)
      .values({ email, client, succeeded: false, at: sql`clock_timestamp()` })
      .returning({ id: signInAttempts.id });
    return { ok: true as const, attemptId: row.id, triesLeft: limits.perEmail - failures - 1 };
  });
}

/** The password was right: the attempt stops counting, and so do the failures before it. */
export async function markAttemptSucceeded(attemptId: number): Promise<void> {
  await db().update(signInAttempts).set({ succeeded: true }).where(eq(signInAttempts.id, attemptId));
}

/** Drops attempts older than the window so the table stays small. */
export async function pruneAttempts(before: Date): Promise<void> {
  await db().delete(signInAttempts).where(sql`${signInAttempts.at} < ${before}`);
}
