import { z } from 'zod';
import { authorize } from '@/app/_lib/auth';
import { errorCodes } from '@/app/_lib/errors';
import { compareCsv, csvTables } from '@/app/(app)/compare/csv';
import { loadComparison } from '@/app/(app)/compare/loadComparison';
import { compareParamsSchema, paramsObject } from '@/app/(app)/compare/params';

export const dynamic = 'force-dynamic';

const apiError = (code: keyof typeof errorCodes, message?: string) =>
  Response.json({ error: { code, message: message ?? errorCodes[code].message } }, { status: errorCodes[code].status });

/** GET /api/compare/csv?table=layers|shift|chamber|control|index|tooling&…the compare page's selection: that table as CSV. */
export async function GET(request: Request): Promise<Response> {
  const query = new URL(request.url).searchParams;
  const table = z.enum(csvTables).safeParse(query.get('table'));
  if (!table.success) return apiError('bad_request:input', `table: must be one of ${csvTables.join(', ')}`);
  query.delete('table');
  const parsed = compareParamsSchema.safeParse(paramsObject(query));
  if (!parsed.success) return apiError('bad_request:input', parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '));
  const auth = await authorize('compareRuns');
  if (!auth.ok) return apiError(auth.code);
  const comparison = await loadComparison(parsed.data);
  const s = comparison.selection;
  const name = s ? `compare-${table.data}-design${s.designId}-${s.from}-${s.to}.csv` : `compare-${table.data}.csv`;
  return new Response(compareCsv(comparison, table.data), {
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${name}"`, 'cache-control': 'no-store' },
  });
}
