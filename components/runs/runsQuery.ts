/** The runs list's URL query: the same keys as GET /api/runs. */
export type RunsQuery = Partial<Record<'page' | 'pageSize' | 'design' | 'chamber' | 'shift' | 'operator' | 'from' | 'to' | 'state' | 'flagged' | 'sort', string>>;

export const queryKeys = ['design', 'chamber', 'shift', 'operator', 'from', 'to', 'state', 'flagged', 'sort', 'page', 'pageSize'] as const;

/** A stable query string: known keys only, in one order, blanks and defaults dropped. */
export function toQueryString(q: RunsQuery): string {
  const p = new URLSearchParams();
  for (const k of queryKeys) {
    const v = q[k]?.trim();
    if (!v) continue;
    if ((k === 'page' && v === '1') || (k === 'sort' && v === '-startedAt')) continue;
    p.set(k, v);
  }
  return p.toString();
}

export function fromSearchParams(sp: Record<string, string | string[] | undefined>): RunsQuery {
  const out: RunsQuery = {};
  for (const k of queryKeys) {
    const v = sp[k];
    const s = Array.isArray(v) ? v[0] : v;
    if (s) out[k] = s;
  }
  return out;
}

export const sortLabels: Record<string, string> = {
  '-startedAt': 'Newest first',
  startedAt: 'Oldest first',
  runCode: 'Run code A–Z',
  '-runCode': 'Run code Z–A',
  chamber: 'Chamber',
  design: 'Design',
};
