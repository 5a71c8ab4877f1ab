import { databaseHealth } from '@/db/queries/health';
import { currentUser } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';

export const dynamic = 'force-dynamic';

/**
 * Public on purpose (load balancers, start scripts): says up or down and nothing else. A
 * signed-in user who may see it (admins) also gets the database's version, latency and migrations.
 */
export async function GET(): Promise<Response> {
  const database = await databaseHealth();
  if (!database.ok) console.error('[fringelog] health: database unreachable:', database.error);
  const headers = { 'cache-control': 'no-store' };
  if (!database.ok) return Response.json({ status: 'down' }, { status: 503, headers });
  return Response.json((await mayReadDetails()) ? { status: 'up', database } : { status: 'up' }, { status: 200, headers });
}

async function mayReadDetails(): Promise<boolean> {
  const user = await currentUser();
  return user !== null && can(user.role, 'viewSystemHealth');
}
