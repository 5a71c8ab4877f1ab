import { z } from 'zod';

/** The form fields of POST /api/runs (shared/FORMATS.md), each optional: the trace's `# key: value` lines fill the gaps. */
export const uploadFieldsSchema = z.object({
  design: z.string().trim().min(1).max(200).optional(),
  designRevision: z.coerce.number().int().positive().optional(),
  chamber: z.string().trim().min(1).max(200).optional(),
  runCode: z.string().trim().min(1).max(100).optional(),
  shift: z.string().trim().max(100).optional(),
  operator: z.string().trim().max(200).optional(),
  startedAt: z.string().trim().max(100).optional(),
});
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

/** The trace's metadata key for each field. */
export const metaKeyOf = { design: 'design', chamber: 'chamber', runCode: 'run', shift: 'shift', operator: 'operator', startedAt: 'date' } as const;

/** A field's value: as sent, else from the trace's metadata, else undefined (blank counts as not sent). */
export function fieldOrMeta(fields: UploadFields, meta: Record<string, string>, key: keyof typeof metaKeyOf): { value: string; from: 'field' | 'trace' } | undefined {
  const sent = fields[key]?.trim();
  if (sent) return { value: sent, from: 'field' };
  const fromTrace = meta[metaKeyOf[key]]?.trim();
  return fromTrace ? { value: fromTrace, from: 'trace' } : undefined;
}

/** ISO 8601 date or date-time; a bare date is read as midnight UTC. */
export function parseStartedAt(text: string): Date | null {
  if (!/^\d{4}-\d{2}-\d{2}([T ][\d:.]+(Z|[+-]\d{2}:?\d{2})?)?$/.test(text)) return null;
  const d = new Date(text.length === 10 ? `${text}T00:00:00Z` : text.replace(' ', 'T'));
  return Number.isNaN(d.getTime()) ? null : d;
}
