import { analysisJson, runJson } from '@/app/_lib/api/json';
import { readableRun } from '@/app/_lib/api/runAccess';
import { latestAnalyses } from '@/db/queries/analyses';

export const dynamic = 'force-dynamic';

/** GET /api/runs/{id} → { run, analyses: the newest analysis per mode (with its result when done) }. */
export async function GET(request: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const found = await readableRun(request, (await ctx.params).id);
  if (!found.ok) return found.response;
  const latest = await latestAnalyses(found.run.run.id);
  const analyses = Object.values(latest).map((a) => analysisJson(a.analysis, a.layers));
  return Response.json({ run: runJson(found.run), analyses });
}
