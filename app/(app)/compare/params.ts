import { z } from 'zod';

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date, YYYY-MM-DD').refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s; // 2026-02-30 would roll over to March
  }, 'is not a real date');
const many = <T extends z.ZodType>(item: T) => z.preprocess((v) => (v === undefined || v === '' ? [] : Array.isArray(v) ? v : [v]), z.array(item));

/**
 * The compare page's selection, as the URL carries it (so a view can be shared):
 * design, revision (number or "all"), start-date range (inclusive), chambers and shifts
 * (repeated; none = all), analysis mode, the figure and layer of the control chart and its
 * baseline period. Anything left out takes a default from the data.
 */
export const compareParamsSchema = z
  .object({
    design: z.coerce.number().int().positive().optional(),
    rev: z.union([z.literal('all'), z.coerce.number().int().positive()]).optional(),
    from: day.optional(),
    to: day.optional(),
    chamber: many(z.coerce.number().int().positive()),
    shift: many(z.string().min(1).max(40)),
    mode: z.enum(['refit', 'sequential']).optional(),
    metric: z.enum(['thickness', 'index', 'cut']).optional(),
    layer: z.coerce.number().int().positive().optional(),
    bfrom: day.optional(),
    bto: day.optional(),
  })
  .refine((p) => !p.from || !p.to || p.from <= p.to, { message: 'the range must not end before it starts', path: ['to'] })
  .refine((p) => !p.bfrom || !p.bto || p.bfrom <= p.bto, { message: 'the baseline must not end before it starts', path: ['bto'] });

export type CompareParams = z.infer<typeof compareParamsSchema>;

/** Next's searchParams (string | string[]) or URLSearchParams as one plain object, repeated keys as arrays. */
export function paramsObject(input: URLSearchParams | Record<string, string | string[] | undefined>): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  const entries: [string, string][] =
    input instanceof URLSearchParams ? [...input.entries()] : Object.entries(input).flatMap(([k, v]) => (v === undefined ? [] : (Array.isArray(v) ? v : [v]).map((x): [string, string] => [k, x])));
  for (const [k, v] of entries) {
    const prev = out[k];
    out[k] = prev === undefined ? v : Array.isArray(prev) ? [...prev, v] : [prev, v];
  }
  return out;
}

/** The selection written back as a query string (for links and the CSV export). */
export function queryOf(p: Record<string, string | number | (string | number)[] | undefined | null>): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(p)) {
    if (v === undefined || v === null) continue;
    for (const x of Array.isArray(v) ? v : [v]) q.append(k, String(x));
  }
  return q.toString();
}
