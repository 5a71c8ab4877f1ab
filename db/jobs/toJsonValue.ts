/**
 * A value as jsonb can hold it: typed arrays become plain arrays, non-finite numbers null
 * (JSON has no NaN or Infinity), undefined keys dropped.
 */
export function toJsonValue(value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (value === null || typeof value !== 'object') return value === undefined ? null : value;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) return Array.from(value as unknown as ArrayLike<number>, (v) => toJsonValue(v));
  if (Array.isArray(value)) return value.map(toJsonValue);
  if (value instanceof Date) return value.toISOString();
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) if (v !== undefined) out[k] = toJsonValue(v);
  return out;
}
