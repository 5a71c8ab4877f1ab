import 'server-only';
import { and, desc, eq, gt, sql } from 'drizzle-orm';
import { db } from '../client';
import { signInAttempts } from '../schema';

/** Failed attempts since the last success within the window, newest first. */
export async function recentFailures(email: string, since: Date): Promise<Date[]> {
  const key = email.toLowerCase();
  const rows = await db()
    .select({ at: signInAttempts.at, succeeded: signInAttempts.succeeded })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.email, key), gt(signInAttempts.at, since)))
    .orderBy(desc(signInAttempts.at))
    .limit(50);
  const failures: Date[] = [];
  for (const r of rows) {
    if (r.succeeded) break;
    failures.push(r.at);
  }
  return failures;
}

export async function recordAttempt(email: string, succeeded: boolean): Promise<void> {
  await db().insert(signInAttempts).values({ email: email.toLowerCase(), succeeded });
}

/** Drops attempts older than the window so the table stays small. */
export async function pruneAttempts(before: Date): Promise<void> {
  await db().delete(signInAttempts).where(sql`${signInAttempts.at} < ${before}`);
}
