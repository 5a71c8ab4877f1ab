import { ensureRunSeries, OVERVIEW_POINTS, plotPoints } from '@/db/jobs';
import { runExists } from '@/db/queries/runs';
import { analysisOfRun, findOverview, readSeriesWindow, readWholeRunSeries } from '@/db/queries/series';
import { authorize } from '@/app/_lib/auth';
import { apiError } from '../apiError';
import { seriesQuery } from './schema';

/** A zoomed window of at most this many samples is sent whole; a wider one is decimated to it. */
const WINDOW_POINTS = 8000;

/**
 * GET /api/runs/{id}/series[?analysis=ID][&from=S&to=S]: the measured reading and the fitted
 * model of one analysis, min–max decimated over the whole run, or at full resolution over a
 * window of from ≤ time ≤ to seconds (decimated only when the window is wider than WINDOW_POINTS samples).
 */
export async function GET(request: Request, { params }: { params: Promise<{ id: string }> }): Promise<Response> {
  const search = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = seriesQuery.safeParse({ ...search, id: (await params).id });
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return apiError('bad_request:input', `${issue.path.join('.') || 'query'}: ${issue.message}`);
  }
  const auth = await authorize('viewRuns');
  if (!auth.ok) return apiError(auth.code);
  const { id, analysis = null, from, to } = parsed.data;
  if (!(await runExists(id))) return apiError('not_found:run');
  if (analysis !== null && !(await analysisOfRun(analysis, id))) return apiError('not_found:run', `run ${id} has no analysis ${analysis}`);
  try {
    await ensureRunSeries(id);
    if (from === undefined || to === undefined) {
      const stored = analysis === null ? undefined : await findOverview(analysis);
      if (stored) return Response.json({ runId: id, analysisId: analysis, decimated: true, ...stored });
      const whole = await readWholeRunSeries(id);
      if (!whole) return apiError('not_found:run', `run ${id} has no trace to plot`);
      return Response.json({ runId: id, analysisId: null, decimated: whole.timeS.length > OVERVIEW_POINTS, ...plotPoints(whole.timeS, whole.signal, null, OVERVIEW_POINTS) });
    }
    const w = await readSeriesWindow(id, analysis, from, to);
    if (!w) return apiError('not_found:run', `run ${id} has no trace to plot`);
    return Response.json({ runId: id, analysisId: analysis, from, to, decimated: w.timeS.length > WINDOW_POINTS, ...plotPoints(w.timeS, w.signal, w.model, WINDOW_POINTS) });
  } catch (err) {
    console.error(`[fringelog] series of run ${id}:`, err);
    return apiError('internal:unexpected');
  }
}
