import { apiError } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { designAndRevision } from '@/app/_lib/designApi';

export const dynamic = 'force-dynamic';

/** The design file of one revision (`?revision=N`, the newest by default) as a download. */
export async function GET(request: Request, { params }: { params: Promise<{ designId: string }> }): Promise<Response> {
  const auth = await authorize('viewDesigns');
  if (!auth.ok) return apiError(auth);
  const found = await designAndRevision((await params).designId, new URL(request.url).searchParams.get('revision'));
  if (!found.ok) return apiError(found);
  const { revision } = found;
  const file = `${revision.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-|-$/g, '') || 'design'}-rev${revision.revision}.json`;
  return new Response(JSON.stringify(revision.document, null, 2) + '\n', {
    headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${file}"`, 'cache-control': 'no-store' },
  });
}
