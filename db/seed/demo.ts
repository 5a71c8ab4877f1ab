import 'server-only';
import { eq } from 'drizzle-orm';
import type { Db, Executor } from '../client';
import { hashPassword } from '../password';
import { appMeta, chambers, users } from '../schema';
import { demoChambers, demoUsers } from './demoData';
import { loadSampleRuns } from './sampleRuns';
import { loadShopHistory } from './shopHistory';

type Step = { key: string; run(db: Executor): Promise<void> };

/**
 * Seed steps, each run once per database and recorded in app_meta; each step is one transaction.
 * The sample runs come after the chambers and users they refer to.
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
  {
    key: 'seed:sample-runs',
    async run(db) {
      const t0 = performance.now();
      const report = await loadSampleRuns(db);
      const failed = report.analyses.filter((a) => a.state === 'failed');
      const slowest = report.analyses.reduce((a, b) => (b.ms > a.ms ? b : a), report.analyses[0]);
      console.log(
        `[fringelog] demo: ${report.designs} designs, ${report.runs} runs, ${report.analyses.length} analyses in ${((performance.now() - t0) / 1000).toFixed(1)} s ${slowest ? `(slowest ${slowest.file} ${slowest.mode} ${(slowest.ms / 1000).toFixed(1)} s)` : ''}`,
      );
      for (const f of failed) if (f.state === 'failed') console.log(`[fringelog] demo analysis failed: ${f.file} (${f.mode}): ${f.error}`);
    },
  },
  {
    key: 'seed:shop-history',
    async run(db) {
      const t0 = performance.now();
      const report = await loadShopHistory(db);
      console.log(
        `[fringelog] demo history: ${report.runs} runs in ${((performance.now() - t0) / 1000).toFixed(1)} s (analyses ${(report.analyseMs / 1000).toFixed(1)} s)`,
      );
      for (const f of report.failed) console.log(`[fringelog] demo history analysis failed: ${f.runCode}: ${f.error}`);
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
