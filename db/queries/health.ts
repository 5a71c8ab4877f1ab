import 'server-only';
import { sql } from 'drizzle-orm';
import { db } from '../client';

export type DbHealth = { ok: true; latencyMs: number; migrations: number; serverVersion: string } | { ok: false; error: string };

export async function databaseHealth(): Promise<DbHealth> {
  const t0 = performance.now();
  try {
    const version = await db().execute<{ server_version: string }>(sql`show server_version`);
    const migrations = await db().execute<{ n: number }>(sql`select count(*)::int as n from drizzle.__drizzle_migrations`);
    return {
      ok: true,
      latencyMs: Math.round((performance.now() - t0) * 10) / 10,
      migrations: migrations.rows[0]?.n ?? 0,
      serverVersion: version.rows[0]?.server_version ?? 'unknown',
    };
  } catch (err) {
    return { ok: false, error: err instanceof Error ? err.message : String(err) };
  }
}
