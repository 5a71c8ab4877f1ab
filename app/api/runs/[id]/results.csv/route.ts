import { z } from 'zod';
import { resultsCsv } from '@/app/_lib/api/resultsCsv';
import { readableRun } from '@/app/_lib/api/runAccess';
import { httpError } from '@/app/_lib/errors';
import { latestAnalyses } from '@/db/queries/analyses';

export const dynamic = 'force-dynamic';

const querySchema = z.object({ mode: z.enum(['sequential', 'refit']).optional() });

/**
 * GET /api/runs/{id}/results.csv[?mode=sequential|refit] → the layer results of the newest finished
 * analysis in that mode (by default refit, else sequential), one row per layer.
 */
export async function GET(request: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const query = querySchema.safeParse({ mode: new URL(request.url).searchParams.get('mode') ?? undefined });
  if (!query.success) return httpError('bad_request:input', 'query parameter "mode": expected sequential or refit', { field: 'mode' });
  const found = await readableRun(request, (await ctx.params).id);
  if (!found.ok) return found.response;
  const latest = await latestAnalyses(found.run.run.id);
  const modes = query.data.mode ? [query.data.mode] : (['refit', 'sequential'] as const);
  const pick = modes.map((m) => latest[m]).find((a) => a?.analysis.state === 'done');
  if (!pick) return httpError('not_found:analysis', `This run has no finished ${query.data.mode ?? ''} analysis yet.`.replace('  ', ' '));
  const name = `${found.run.run.runCode}-${pick.analysis.mode}-results.csv`.replace(/[^\w.-]/g, '_');
  return new Response(resultsCsv(pick.layers), {
    headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="${name}"`, 'X-Analysis-Id': String(pick.analysis.id) },
  });
}
