// Migrates the database named by DATABASE_URL and seeds the demo once. Run by npm start / npm test.
import path from 'node:path';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { closeDb, db } from '../client';
import { ensureDemoChamberToken } from '../queries/chamberTokens';
import { startBoss } from '../jobs/queue';
import { seedDemo } from '../seed/demo';
import { demoUsers } from '../seed/demoData';

const root = path.resolve(import.meta.dirname, '..', '..');

try {
  await migrate(db(), { migrationsFolder: path.join(root, 'drizzle') });
  const ran = await seedDemo(db());
  // pg-boss's own tables and the analysis queue, so the web server and the workers find them.
  await (await startBoss({ supervise: false, schedule: false })).stop({ graceful: false, wait: true });
  const demoToken = process.env.FRINGELOG_DEMO_TOKEN;
  if (demoToken) {
    await ensureDemoChamberToken(demoToken);
    console.log('[fringelog] FRINGELOG_DEMO_TOKEN: a chamber token with that value uploads to the first chamber');
  }
  console.log(`[fringelog] database migrated${ran.length ? `; seeded ${ran.join(', ')}` : ''}`);
  for (const u of demoUsers) console.log(`SIGN-IN ${u.role.padEnd(10)} ${u.email.padEnd(26)} ${u.password}`);
} catch (err) {
  console.error(`[fringelog] ERROR: database preparation failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 1;
} finally {
  await closeDb();
}
