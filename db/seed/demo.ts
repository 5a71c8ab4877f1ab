import 'server-only';
import { eq } from 'drizzle-orm';
import type { Db, Executor } from '../client';
import { hashPassword } from '../password';
import { appMeta, chambers, users } from '../schema';
import { demoChambers, demoUsers } from './demoData';


type Step = { key: string; run(db: Executor): Promise<void> };

/**
 * Seed steps, each run once per database and recorded in app_meta. A later step that loads the
 * demo designs and runs from sample-traces/ is appended here, after the chambers and users it
 * refers to.
 */
export const seedSteps: Step[] = [
  {
    key: 'seed:chambers',
    async run(db) {
      await db.insert(chambers).values(demoChambers).onConflictDoNothing();
    },
  },
  {
    key: 'seed:users',
    async run(db) {
      for (const u of demoUsers) {
        const passwordHash = await hashPassword(u.password);
        await db.insert(users).values({ name: u.name, email: u.email, role: u.role, status: 'active', passwordHash }).onConflictDoNothing();
      }
    },
  },
];

/** Runs the steps not yet recorded; returns the keys it ran. */
export async function seedDemo(db: Db): Promise<string[]> {
  const ran: string[] = [];
  for (const step of seedSteps) {
    const [done] = await db.select().from(appMeta).where(eq(appMeta.key, step.key));
    if (done) continue;
    await db.transaction(async (tx) => {
      await step.run(tx);
      await tx.insert(appMeta).values({ key: step.key, value: new Date().toISOString() });
    });
    ran.push(step.key);
  }
  return ran;
}
