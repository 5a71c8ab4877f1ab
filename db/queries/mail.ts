import 'server-only';
import { desc, eq } from 'drizzle-orm';
import { db } from '../client';
import { caughtMail, type CaughtMail } from '../schema';

export type CaughtMailInput = Omit<typeof caughtMail.$inferInsert, 'id' | 'receivedAt'>;

export async function storeCaughtMail(message: CaughtMailInput): Promise<number> {
  const [row] = await db().insert(caughtMail).values(message).returning({ id: caughtMail.id });
  return row.id;
}

export async function listCaughtMail(limit = 100): Promise<Omit<CaughtMail, 'raw'>[]> {
  return db()
    .select({
      id: caughtMail.id,
      receivedAt: caughtMail.receivedAt,
      envelopeFrom: caughtMail.envelopeFrom,
      envelopeTo: caughtMail.envelopeTo,
      subject: caughtMail.subject,
      textBody: caughtMail.textBody,
    })
    .from(caughtMail)
    .orderBy(desc(caughtMail.id))
    .limit(limit);
}

export async function findCaughtMail(id: number): Promise<CaughtMail | undefined> {
  const [row] = await db().select().from(caughtMail).where(eq(caughtMail.id, id));
  return row;
}
