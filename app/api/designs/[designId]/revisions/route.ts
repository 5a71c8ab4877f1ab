import { apiError, readJsonBody } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { idParam } from '@/app/_lib/designApi';
import { saveDesignRevision } from '@/app/_lib/designService';
import { failure } from '@/app/_lib/errors';
import { findDesignWithRevisions } from '@/db/queries/designs';

export const dynamic = 'force-dynamic';

/** A new revision of this design from a design file body (its name is the design's, whatever the file says). */
export async function POST(request: Request, { params }: { params: Promise<{ designId: string }> }): Promise<Response> {
  const body = await readJsonBody(request);
  if (!body.ok) return apiError(body);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return apiError(auth);
  const designId = idParam((await params).designId);
  const design = designId ? await findDesignWithRevisions(designId) : undefined;
  if (!design) return apiError(failure('not_found:design'));
  const saved = await saveDesignRevision(body.value, auth.user.id, { via: 'edited', name: design.name });
  if (!saved.ok) return apiError(saved);
  return Response.json({ design: { id: design.id, name: design.name, url: `/designs/${design.id}` }, revision: saved.data.revision }, { status: 201 });
}
