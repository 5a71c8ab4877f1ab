import { apiError } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { designAndRevision, revisionJson } from '@/app/_lib/designApi';

export const dynamic = 'force-dynamic';

/** A design: its revisions and one of them in full (`?revision=N`, the newest by default). */
export async function GET(request: Request, { params }: { params: Promise<{ designId: string }> }): Promise<Response> {
  const auth = await authorize('viewDesigns');
  if (!auth.ok) return apiError(auth);
  const found = await designAndRevision((await params).designId, new URL(request.url).searchParams.get('revision'));
  if (!found.ok) return apiError(found);
  const { design, revision } = found;
  return Response.json({ design: { id: design.id, name: design.name, revisions: design.revisions }, revision: revisionJson(revision) });
}
