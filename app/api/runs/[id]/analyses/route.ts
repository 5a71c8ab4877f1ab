import { analysisJson } from '@/app/_lib/api/json';
import { idParam } from '@/app/_lib/api/runAccess';
import { authorizeCaller } from '@/app/_lib/caller';
import { httpError, httpFailure, unexpected } from '@/app/_lib/errors';
import { analysisSettingsSchema } from '@/db/jobs/analysisSettings';
import { queueAnalysis } from '@/db/jobs/queueAnalysis';
import { runExists } from '@/db/queries/runs';

export const dynamic = 'force-dynamic';

/** POST /api/runs/{id}/analyses (JSON: mode and fit settings) → 201 { analysis } queued; engineers and admins. */
export async function POST(request: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const id = idParam.safeParse((await ctx.params).id);
  if (!id.success) return httpError('not_found:run');
  if (!/^application\/json\b/i.test(request.headers.get('content-type') ?? '')) return httpError('unsupported_media_type:upload', 'expected application/json with the analysis settings');
  const body: unknown = await request.json().catch(() => undefined);
  const settings = analysisSettingsSchema.safeParse(body);
  if (!settings.success) {
    const issue = settings.error.issues[0];
    return httpError('bad_request:input', `${issue.path.join('.') || 'settings'}: ${issue.message}`, { field: String(issue.path[0] ?? '') || undefined });
  }
  const auth = await authorizeCaller(request, 'reanalyseRuns', false);
  if (!auth.ok) return httpFailure(auth);
  if (auth.caller.kind !== 'user') return httpError('forbidden:role');
  if (!(await runExists(id.data))) return httpError('not_found:run');
  try {
    const analysis = await queueAnalysis(id.data, settings.data, auth.caller.user.id);
    return Response.json({ analysis: analysisJson(analysis) }, { status: 201 });
  } catch (err) {
    return httpError(unexpected('re-analysis', err).code);
  }
}
