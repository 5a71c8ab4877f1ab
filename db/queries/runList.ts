import 'server-only';
import { sql, type SQL } from 'drizzle-orm';
import { db } from '../client';
import type { RunListRow } from './runs';
import { warningCountSql } from './runNotes';

export type RunState = 'queued' | 'running' | 'done' | 'failed';

export type RunFilters = {
  design?: string;
  chamber?: string;
  /** A chamber token sees only its own chamber. */
  chamberId?: number;
  shift?: string;
  operator?: string;
  /** startedAt on or after / before (exclusive). */
  from?: Date;
  to?: Date;
  state?: RunState;
  flagged?: boolean;
  sort: RunSort;
  page: number;
  pageSize: number;
};

export const runSorts = ['-startedAt', 'startedAt', 'runCode', '-runCode', 'chamber', '-chamber', 'design', '-design'] as const;
export type RunSort = (typeof runSorts)[number];

/** A row of the runs list: the fields of listRuns' rows, the disposition, and why the run needs a look. */
export type RunSummaryRow = Omit<RunListRow, 'analysisState' | 'worstCutMode'> & {
  createdAt: Date;
  disposition: 'accepted' | 'on_hold' | 'rejected' | null;
  /** Across the newest analysis of each mode: running if any runs, else queued if any waits, else failed if any failed, else done. */
  analysisState: RunState | null;
  /** Warnings of the newest finished analyses (each mode). */
  warningCount: number;
  /** Layers cut outside tolerance in the newest finished analyses (the most of any mode). */
  cutsOutsideTolerance: number;
  /** Needs attention: a failed analysis, a warning, or a cut outside tolerance. */
  flagged: boolean;
};

const orderBy: Record<RunSort, SQL> = {
  '-startedAt': sql`r.started_at desc nulls last, r.id desc`,
  startedAt: sql`r.started_at asc nulls last, r.id asc`,
  runCode: sql`r.run_code asc, r.id asc`,
  '-runCode': sql`r.run_code desc, r.id desc`,
  chamber: sql`c.name asc, r.started_at desc nulls last, r.id desc`,
  '-chamber': sql`c.name desc, r.started_at desc nulls last, r.id desc`,
  design: sql`dr.name asc, r.started_at desc nulls last, r.id desc`,
  '-design': sql`dr.name desc, r.started_at desc nulls last, r.id desc`,
};

/** One page of runs matching the filters, with the total count, for GET /api/runs and the runs list. */
export async function searchRuns(f: RunFilters): Promise<{ rows: RunSummaryRow[]; total: number }> {
  const where: SQL[] = [sql`true`];
  if (f.design) where.push(sql`dr.name = ${f.design}`);
  if (f.chamber) where.push(sql`c.name = ${f.chamber}`);
  if (f.chamberId !== undefined) where.push(sql`r.chamber_id = ${f.chamberId}`);
  if (f.shift) where.push(sql`lower(r.shift) = lower(${f.shift})`);
  if (f.operator) where.push(sql`lower(coalesce(u.name, r.operator_name)) = lower(${f.operator})`);
  if (f.from) where.push(sql`r.started_at >= ${f.from.toISOString()}`);
  if (f.to) where.push(sql`r.started_at < ${f.to.toISOString()}`);
  if (f.state) where.push(sql`s.state = ${f.state}`);
  if (f.flagged !== undefined) where.push(f.flagged ? sql`s.flagged` : sql`not s.flagged`);
  // the analyses' warnings, not their notes (runNotes.ts)
  const warnings = warningCountSql(sql`a.warnings`);
  const result = await db().execute<Record<string, unknown>>(sql`
    select r.id, r.run_code, dr.name as design_name, dr.revision as design_revision, c.name as chamber_name,
           coalesce(u.name, r.operator_name) as operator_name, r.shift, r.started_at, r.created_at, r.status, r.disposition,
           s.state, s.warning_count, s.cuts_outside, s.worst_cut, s.flagged, count(*) over () as total
    from runs r
    join design_revisions dr on dr.id = r.design_revision_id
    join chambers c on c.id = r.chamber_id
    left join users u on u.id = r.operator_id
    left join lateral (
      select case when bool_or(a.state = 'running') then 'running' when bool_or(a.state = 'queued') then 'queued'
                  when bool_or(a.state = 'failed') then 'failed' when count(*) > 0 then 'done' end as state,
             coalesce(sum(${warnings}) filter (where a.state = 'done'), 0)::int as warning_count,
             coalesce(max(a.cuts_outside_tolerance) filter (where a.state = 'done'), 0)::int as cuts_outside,
             (select max(abs(lr.cut_error_qwot_pct)) from layer_results lr where lr.analysis_id = max(a.id) filter (where a.state = 'done')) as worst_cut,
             coalesce(bool_or(a.state = 'failed' or (a.state = 'done' and (${warnings} > 0 or a.cuts_outside_tolerance > 0))), false) as flagged
      from (select distinct on (x.mode) x.* from analyses x where x.run_id = r.id order by x.mode, x.id desc) a
    ) s on true
    where ${sql.join(where, sql` and `)}
    order by ${orderBy[f.sort]}
    limit ${f.pageSize} offset ${(f.page - 1) * f.pageSize}`);
  const rows = result.rows.map(
    (r): RunSummaryRow => ({
      id: Number(r.id),
      runCode: String(r.run_code),
      designName: String(r.design_name),
      designRevision: Number(r.design_revision),
      chamberName: String(r.chamber_name),
      operatorName: (r.operator_name as string | null) ?? null,
      shift: (r.shift as string | null) ?? null,
      startedAt: r.started_at ? new Date(r.started_at as string) : null,
      createdAt: new Date(r.created_at as string),
      status: r.status as RunSummaryRow['status'],
      disposition: (r.disposition as RunSummaryRow['disposition']) ?? null,
      analysisState: (r.state as RunState | null) ?? null,
      warningCount: Number(r.warning_count ?? 0),
      cutsOutsideTolerance: Number(r.cuts_outside ?? 0),
      worstCutErrorQwotPct: r.worst_cut === null || r.worst_cut === undefined ? null : Number(r.worst_cut),
      flagged: Boolean(r.flagged),
    }),
  );
  let total = rows.length ? Number(result.rows[0].total) : 0;
  if (!rows.length && f.page > 1) {
    const again = await searchRuns({ ...f, page: 1, pageSize: 1 });
    total = again.total;
  }
  return { rows, total };
}
