import { z } from 'zod';
import { runSorts } from '@/db/queries/runList';

const isoDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'expected a date as YYYY-MM-DD')
  .transform((s) => new Date(`${s}T00:00:00Z`));

/** The query string of GET /api/runs (and of the runs list page, which passes it through). */
export const runsQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  design: z.string().trim().min(1).optional(),
  chamber: z.string().trim().min(1).optional(),
  shift: z.string().trim().min(1).optional(),
  operator: z.string().trim().min(1).optional(),
  /** Started on or after this day (UTC). */
  from: isoDate.optional(),
  /** Started on or before this day (UTC). */
  to: isoDate.transform((d) => new Date(d.getTime() + 86_400_000)).optional(),
  state: z.enum(['queued', 'running', 'done', 'failed']).optional(),
  flagged: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
  sort: z.enum(runSorts).default('-startedAt'),
});
export type RunsQuery = z.infer<typeof runsQuerySchema>;

/** Query-string entries to an object for zod; blank values count as absent. */
export function queryObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) if (v.trim() !== '') out[k] = v;
  return out;
}
