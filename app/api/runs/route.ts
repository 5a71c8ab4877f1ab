import { authorizeCaller, chamberScope } from '@/app/_lib/caller';
import { httpError, httpFailure, unexpected } from '@/app/_lib/errors';
import { runSummaryJson } from '@/app/_lib/api/json';
import { queryObject, runsQuerySchema } from '@/app/_lib/api/runsQuery';
import { ChamberMismatch, RunCodeTakenError, storeUpload, UploadRefused } from '@/app/_lib/upload/storeUpload';
import { MAX_UPLOAD_BYTES } from '@/app/_lib/upload/receiveUpload';
import { searchRuns } from '@/db/queries/runList';

export const dynamic = 'force-dynamic';

/** GET /api/runs?page&pageSize&design&chamber&shift&operator&from&to&state&flagged&sort → { runs, total }. */
export async function GET(request: Request): Promise<Response> {
  const query = runsQuerySchema.safeParse(queryObject(new URL(request.url).searchParams));
  if (!query.success) {
    const issue = query.error.issues[0];
    return httpError('bad_request:input', `query parameter "${String(issue.path[0])}": ${issue.message}`, { field: String(issue.path[0]) });
  }
  const auth = await authorizeCaller(request, 'viewRuns', true);
  if (!auth.ok) return httpFailure(auth);
  const scope = chamberScope(auth.caller);
  const { rows, total } = await searchRuns({ ...query.data, ...(scope !== null ? { chamberId: scope } : {}) });
  return Response.json({ runs: rows.map(runSummaryJson), total, page: query.data.page, pageSize: query.data.pageSize });
}

/** POST /api/runs (multipart: trace, design, designRevision, chamber, runCode, shift, operator, startedAt) → 201. */
export async function POST(request: Request): Promise<Response> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data\b/i.test(type)) return httpError('unsupported_media_type:upload', `expected multipart/form-data with a file field "trace", got ${type || 'no Content-Type'}`);
  // A declared length past the limit (plus room for the form's other parts) is refused unread.
  const declared = Number(request.headers.get('content-length') ?? NaN);
  if (declared > MAX_UPLOAD_BYTES + 64 * 1024) return httpError('too_large:upload', `the upload is larger than the limit of ${MAX_UPLOAD_BYTES / 1024 / 1024} MiB`);
  const auth = await authorizeCaller(request, 'uploadRuns', true);
  if (!auth.ok) return httpFailure(auth);
  try {
    const stored = await storeUpload(request, auth.caller, MAX_UPLOAD_BYTES);
    return Response.json(stored, { status: 201, headers: { Location: stored.run.url } });
  } catch (err) {
    if (err instanceof UploadRefused) return httpError(err.code, err.message, err.place);
    if (err instanceof RunCodeTakenError) return httpError('conflict:run_code', err.message, { field: 'runCode' });
    if (err instanceof ChamberMismatch) return httpError('forbidden:chamber', err.message, { field: 'chamber' });
    const f = unexpected('upload', err);
    return httpError(f.code);
  }
}
