import { apiError, readJsonBody } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { saveDesignRevision } from '@/app/_lib/designService';
import { listDesigns } from '@/db/queries/designs';

export const dynamic = 'force-dynamic';

/** Every design with its newest revision. Operators, engineers, supervisors, admins. */
export async function GET(): Promise<Response> {
  const auth = await authorize('viewDesigns');
  if (!auth.ok) return apiError(auth);
  return Response.json({ designs: await listDesigns() });
}

/**
 * Import: the body is a design file ("fringelog.design/1"); it becomes the next revision of the
 * design of its name (a new design when the name is new). Engineers and admins.
 */
export async function POST(request: Request): Promise<Response> {
  const body = await readJsonBody(request);
  if (!body.ok) return apiError(body);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return apiError(auth);
  const fileName = new URL(request.url).searchParams.get('fileName') ?? undefined;
  const saved = await saveDesignRevision(body.value, auth.user.id, { via: 'imported', fileName });
  if (!saved.ok) return apiError(saved);
  const r = saved.data;
  return Response.json({ design: { id: r.designId, name: r.name, url: `/designs/${r.designId}` }, revision: r.revision }, { status: 201 });
}
