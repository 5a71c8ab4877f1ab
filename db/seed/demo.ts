import 'server-only';
import { eq } from 'drizzle-orm';
import type { Db, Executor } from '../client';
import { hashPassword } from '../password';
import { appMeta, chambers, users, type Role } from '../schema';

/** The invented shop of the demo. Passwords are printed by `npm start`; demo data only. */
export const demoChambers = [
  { name: 'Bay 1 e-beam', process: 'electron-beam evaporation', description: 'Box coater with a four-pocket e-beam gun and a quartz-crystal monitor.' },
  { name: 'Bay 2 IAD', process: 'ion-assisted e-beam deposition', description: 'E-beam coater with an end-Hall ion source for dense oxide layers.' },
  { name: 'Bay 3 sputter', process: 'magnetron sputtering', description: 'Reactive magnetron sputter line with a rotating drum.' },
];

export const demoUsers: { name: string; email: string; role: Role; password: string }[] = [
  { name: 'Tamsin Reyes', email: 'tamsin@larkspur.example', role: 'operator', password: 'larkspur-operator-1' },
  { name: 'Idris Vantongeren', email: 'idris@larkspur.example', role: 'engineer', password: 'larkspur-engineer-1' },
  { name: 'Wren Halloway', email: 'wren@larkspur.example', role: 'supervisor', password: 'larkspur-supervisor-1' },
  { name: 'Bodhi Castellan', email: 'bodhi@larkspur.example', role: 'admin', password: 'larkspur-admin-1' },
];

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
