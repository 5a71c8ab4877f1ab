import 'server-only';
import { drizzle } from 'drizzle-orm/node-postgres';
import { pool, type Db } from '../client';
import * as schema from '../schema';

/** SQL on the transaction's own connection, for libraries that take a bare executor (pg-boss's `db` option). */
export type RawExecutor = { executeSql(text: string, values: unknown[]): Promise<{ rows: unknown[] }> };

/**
 * One transaction on a connection of its own, held for as long as `work` runs (an upload streams
 * inside it). Commits when `work` resolves, rolls back when it throws: nothing is half-written.
 */
export async function withTransaction<T>(work: (tx: Db, raw: RawExecutor) => Promise<T>): Promise<T> {
  const client = await pool().connect();
  let broken = false;
  try {
    await client.query('begin');
    const tx = drizzle(client, { schema });
    const raw: RawExecutor = { executeSql: async (text, values) => client.query(text, values) };
    const out = await work(tx, raw);
    await client.query('commit');
    return out;
  } catch (err) {
    await client.query('rollback').catch(() => {
      broken = true;
    });
    throw err;
  } finally {
    client.release(broken);
  }
}
