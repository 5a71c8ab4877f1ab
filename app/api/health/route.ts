import { databaseHealth } from '@/db/queries/health';

export const dynamic = 'force-dynamic';

/** Public on purpose (load balancers, start scripts): reports only database state. */
export async function GET(): Promise<Response> {
  const database = await databaseHealth();
  if (!database.ok) console.error('[fringelog] health: database unreachable:', database.error);
  return Response.json(
    { status: database.ok ? 'ok' : 'degraded', database: database.ok ? database : { ok: false, error: 'database unreachable' } },
    { status: database.ok ? 200 : 503, headers: { 'cache-control': 'no-store' } },
  );
}
