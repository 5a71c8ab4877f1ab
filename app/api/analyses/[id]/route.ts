import { analysisJson } from '@/app/_lib/api/json';
import { idParam } from '@/app/_lib/api/runAccess';
import { authorizeCaller } from '@/app/_lib/caller';
import { httpError, httpFailure } from '@/app/_lib/errors';
import { findAnalysis } from '@/db/queries/analyses';
import { findRun } from '@/db/queries/runs';

export const dynamic = 'force-dynamic';

/** GET /api/analyses/{id} → { id, runId, mode, state, error? (failed), result? (done: the `analyze` JSON) }. */
export async function GET(request: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const id = idParam.safeParse((await ctx.params).id);
  if (!id.success) return httpError('not_found:analysis');
  const auth = await authorizeCaller(request, 'viewRuns', true);
  if (!auth.ok) return httpFailure(auth);
  const found = await findAnalysis(id.data);
  if (!found) return httpError('not_found:analysis');
  if (auth.caller.kind === 'chamber') {
    const run = await findRun(found.analysis.runId);
    if (run?.run.chamberId !== auth.caller.token.chamberId) return httpError('forbidden:chamber');
  }
  return Response.json(analysisJson(found.analysis, found.layers));
}
