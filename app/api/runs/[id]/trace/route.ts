import { readableRun } from '@/app/_lib/api/runAccess';
import { httpError } from '@/app/_lib/errors';
import { traceFileChunks } from '@/db/queries/runs';

export const dynamic = 'force-dynamic';

/** GET /api/runs/{id}/trace → the raw trace file, byte for byte as uploaded, streamed from its stored slices. */
export async function GET(request: Request, ctx: { params: Promise<{ id: string }> }): Promise<Response> {
  const found = await readableRun(request, (await ctx.params).id);
  if (!found.ok) return found.response;
  const trace = found.run.trace;
  if (!trace) return httpError('not_found:run', 'This run has no trace file.');
  const chunks = traceFileChunks(found.run.run.id);
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      const next = await chunks.next();
      if (next.done) controller.close();
      else controller.enqueue(next.value);
    },
    async cancel() {
      await chunks.return(undefined);
    },
  });
  const asciiName = trace.fileName.replace(/[^\x20-\x7e]|["\\]/g, '_');
  return new Response(body, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Length': String(trace.byteSize),
      'Content-Disposition': `attachment; filename="${asciiName}"; filename*=UTF-8''${encodeURIComponent(trace.fileName)}`,
      'X-Content-SHA256': trace.sha256,
    },
  });
}
