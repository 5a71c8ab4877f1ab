import 'server-only';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { Pool } from 'pg';
import { env } from './env';
import * as schema from './schema';

export type Db = NodePgDatabase<typeof schema>;
/** A database handle or an open transaction: query functions accept either. */
export type Executor = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

const globalForDb = globalThis as unknown as { fringelogPool?: Pool; fringelogDb?: Db };

export function pool(): Pool {
  if (!globalForDb.fringelogPool) {
    const p = new Pool({ connectionString: env().DATABASE_URL, max: 10 });
    // An idle client losing its connection (PostgreSQL restarted or stopped) must not end the process; the next query reconnects.
    p.on('error', (err) => console.error(`[fringelog] database connection lost: ${err.message}`));
    globalForDb.fringelogPool = p;
  }
  return globalForDb.fringelogPool;
}

export function db(): Db {
  globalForDb.fringelogDb ??= drizzle(pool(), { schema });
  return globalForDb.fringelogDb;
}

/** Closes the pool (scripts and tests). */
export async function closeDb(): Promise<void> {
  const p = globalForDb.fringelogPool;
  globalForDb.fringelogPool = undefined;
  globalForDb.fringelogDb = undefined;
  if (p) await p.end();
}
