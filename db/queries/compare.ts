import 'server-only';
import { sql, type SQL } from 'drizzle-orm';
import { SHOP_DEFAULT_TOLERANCE } from '../../analysis/design';
import { db, type Executor } from '../client';
import type { AnalysisMode } from './analyses';

/** Which runs a comparison reads: one design (one revision or all), a start-date range, chambers and shifts (empty = all). */
export type CompareFilter = {
  designId: number;
  revision: number | null;
  /** Inclusive start of the range of run start dates. */
  from: Date;
  /** Exclusive end. */
  to: Date;
  chamberIds: number[];
  shifts: string[];
  mode: AnalysisMode;
};

/** The three per-layer figures compared, as columns of the `m` set below. */
export const compareMetrics = ['thickness', 'index', 'cut'] as const;
export type CompareMetric = (typeof compareMetrics)[number];
const metricColumn: Record<CompareMetric, SQL> = { thickness: sql.raw('thickness'), index: sql.raw('index_dev'), cut: sql.raw('cut') };
const toleranceColumn: Record<CompareMetric, SQL> = { thickness: sql.raw('tol_thickness'), index: sql.raw('tol_index'), cut: sql.raw('tol_cut') };

const list = (values: (number | string)[]) => sql.join(values.map((v) => sql`${v}`), sql`, `);

/**
 * The chosen runs' newest finished analysis in the mode, one row per layer as `m`: thickness
 * error (% of the design thickness), index deviation from nominal (null where the index was
 * held), cut error (% QWOT), the crystal ratio, and each figure's limit (layer → design → shop
 * default, as analysis/design/tolerance.ts resolves them, read from the revision's document).
 */
/**
 * A layer result's figures as select-list columns of `lr` (layer_results): thickness error (% of
 * the design thickness), index deviation from nominal (null where the index was held), cut error
 * (% QWOT) and the crystal ratio.
 */
export function layerFigures(): SQL {
  return sql`lr.layer, lr.material, lr.index as idx,
        (lr.thickness_nm / nullif((lr.detail->>'designThicknessNm')::float8, 0) - 1) * 100 as thickness,
        case when (lr.detail->>'indexHeld')::boolean then null else lr.index - (lr.detail->>'nominalIndex')::float8 end as index_dev,
        lr.cut_error_qwot_pct as cut,
        (lr.detail->>'opticalToCrystalRatio')::float8 as tooling`;
}

/**
 * A `limits` set: each layer's limits of the given design revisions (layer → design → shop
 * default, as analysis/design/tolerance.ts resolves them), read once per revision from its
 * document rather than once per layer result.
 */
export function layerLimits(revisionIds: SQL): SQL {
  const d = SHOP_DEFAULT_TOLERANCE;
  const tol = (key: string, fallback: number) =>
    sql`coalesce((e.item->'tolerance'->>${key})::float8, (dr.document->'tolerance'->>${key})::float8, ${fallback}::float8)`;
  return sql`limits as (
      select dr.id as revision_id, e.ord::int as layer,
        ${tol('thicknessPct', d.thicknessPct)} as tol_thickness,
        ${tol('indexAbs', d.indexAbs)} as tol_index,
        ${tol('cutErrorQwotPct', d.cutErrorQwotPct)} as tol_cut
      from design_revisions dr cross join lateral jsonb_array_elements(dr.document->'layers') with ordinality as e(item, ord)
      where dr.id in (${revisionIds})
    )`;
}

/** The chosen runs' newest finished analysis in the mode, one row per layer with its figures and limits, as `m`. */
function layersOf(f: CompareFilter): SQL {
  return sql`
    with picked as (
      select distinct on (r.id) r.id as run_id, r.run_code, r.shift, r.started_at, c.name as chamber, a.id as analysis_id, r.design_revision_id as revision_id
      from runs r
      join design_revisions dr on dr.id = r.design_revision_id
      join chambers c on c.id = r.chamber_id
      join analyses a on a.run_id = r.id and a.state = 'done' and a.mode = ${f.mode}
      where dr.design_id = ${f.designId}
        ${f.revision === null ? sql`` : sql`and dr.revision = ${f.revision}`}
        and r.started_at >= ${f.from} and r.started_at < ${f.to}
        ${f.chamberIds.length ? sql`and r.chamber_id in (${list(f.chamberIds)})` : sql``}
        ${f.shifts.length ? sql`and r.shift in (${list(f.shifts)})` : sql``}
      order by r.id, a.id desc
    ), ${layerLimits(sql`select distinct revision_id from picked`)}, m as (
      select p.run_id, p.run_code, p.shift, p.started_at, p.chamber, ${layerFigures()}, l.tol_thickness, l.tol_index, l.tol_cut
      from picked p join layer_results lr on lr.analysis_id = p.analysis_id
      left join limits l on l.revision_id = p.revision_id and l.layer = lr.layer
    )`;
}

/** count, mean, sample sd (PostgreSQL's stddev_samp), number beyond the limit, and the largest limit met. */
function stats(metric: CompareMetric, prefix: string): SQL {
  const v = metricColumn[metric];
  const t = toleranceColumn[metric];
  const p = sql.raw(prefix);
  return sql`count(${v})::int as ${p}_n, avg(${v}) as ${p}_mean, stddev_samp(${v}) as ${p}_sd,
    (count(*) filter (where abs(${v}) > ${t}))::int as ${p}_out, max(${t}) as ${p}_limit`;
}

export type MetricStats = { n: number; mean: number | null; sd: number | null; out: number; limit: number | null };
export type LayerSummaryRow = { layer: number; material: string; runs: number } & Record<CompareMetric, MetricStats>;

type Raw = Record<string, unknown>;
const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));
const statsOf = (r: Raw, p: string): MetricStats => ({
  n: Number(r[`${p}_n`]), mean: num(r[`${p}_mean`]), sd: num(r[`${p}_sd`]), out: Number(r[`${p}_out`]), limit: num(r[`${p}_limit`]),
});

/** Per layer, across the chosen runs: each figure's count, mean, sd and out-of-tolerance count. */
export async function compareLayerSummary(f: CompareFilter, ex: Executor = db()): Promise<LayerSummaryRow[]> {
  const res = await ex.execute<Raw>(sql`${layersOf(f)}
    select layer, min(material) as material, count(*)::int as runs, ${stats('thickness', 't')}, ${stats('index', 'i')}, ${stats('cut', 'c')}
    from m group by layer order by layer`);
  return res.rows.map((r) => ({
    layer: Number(r.layer), material: String(r.material), runs: Number(r.runs), thickness: statsOf(r, 't'), index: statsOf(r, 'i'), cut: statsOf(r, 'c'),
  }));
}

export type GroupStatsRow = { layer: number; group: string } & MetricStats;

/** Per layer and shift (or chamber): one figure's count, mean, sd and out-of-tolerance count. */
export async function compareGroupStats(f: CompareFilter, by: 'shift' | 'chamber', metric: CompareMetric, ex: Executor = db()): Promise<GroupStatsRow[]> {
  const group = by === 'shift' ? sql.raw(`coalesce(shift, '(none)')`) : sql.raw('chamber');
  const res = await ex.execute<Raw>(sql`${layersOf(f)}
    select layer, ${group} as grp, ${stats(metric, 's')}
    from m group by layer, ${group} order by layer, ${group}`);
  return res.rows.map((r) => ({ layer: Number(r.layer), group: String(r.grp), ...statsOf(r, 's') }));
}

export type SeriesPoint = { runId: number; runCode: string; startedAt: Date; chamber: string; shift: string | null; value: number };

/** One layer's figure, run by run in order of start (the points of a control chart). */
export async function compareSeries(f: CompareFilter, layer: number, metric: CompareMetric, ex: Executor = db()): Promise<SeriesPoint[]> {
  return seriesOf(f, metric, layer, ex);
}

/** Every layer's figure, run by run in order of start (for checking the newest run against its predecessors). */
export async function compareSeriesAllLayers(f: CompareFilter, metric: CompareMetric, ex: Executor = db()): Promise<(SeriesPoint & { layer: number })[]> {
  return seriesOf(f, metric, null, ex);
}

async function seriesOf(f: CompareFilter, metric: CompareMetric, layer: number | null, ex: Executor): Promise<(SeriesPoint & { layer: number })[]> {
  const v = metricColumn[metric];
  const res = await ex.execute<Raw>(sql`${layersOf(f)}
    select layer, run_id, run_code, started_at, chamber, shift, ${v} as value from m
    where ${v} is not null ${layer === null ? sql`` : sql`and layer = ${layer}`} order by layer, started_at, run_id`);
  return res.rows.map((r) => ({
    layer: Number(r.layer), runId: Number(r.run_id), runCode: String(r.run_code), startedAt: new Date(r.started_at as string), chamber: String(r.chamber),
    shift: (r.shift as string | null) ?? null, value: Number(r.value),
  }));
}

export type MaterialPoint = { runId: number; runCode: string; startedAt: Date; chamber: string; material: string; value: number; layers: number };

/** Each material's mean fitted index per run (layers whose index was fitted, not held). */
export async function compareIndexHistory(f: CompareFilter, ex: Executor = db()): Promise<MaterialPoint[]> {
  return materialPoints(f, sql.raw('idx'), sql.raw('index_dev is not null'), ex);
}

/** Each material's mean optical-to-crystal thickness ratio (the tooling factor) per run, where the trace had crystal readings. */
export async function compareToolingHistory(f: CompareFilter, ex: Executor = db()): Promise<MaterialPoint[]> {
  return materialPoints(f, sql.raw('tooling'), sql.raw('tooling is not null'), ex);
}

async function materialPoints(f: CompareFilter, value: SQL, where: SQL, ex: Executor): Promise<MaterialPoint[]> {
  const res = await ex.execute<Raw>(sql`${layersOf(f)}
    select run_id, run_code, started_at, chamber, material, avg(${value}) as value, count(*)::int as layers from m
    where ${where} group by run_id, run_code, started_at, chamber, material order by material, started_at, run_id`);
  return res.rows.map((r) => ({
    runId: Number(r.run_id), runCode: String(r.run_code), startedAt: new Date(r.started_at as string), chamber: String(r.chamber),
    material: String(r.material), value: Number(r.value), layers: Number(r.layers),
  }));
}

export type ComparableDesign = { id: number; name: string; revisions: number[]; firstRun: Date | null; lastRun: Date | null; runs: number };

/** Designs with at least one run, their revisions and the span of their runs' start dates. */
export async function listComparableDesigns(ex: Executor = db()): Promise<ComparableDesign[]> {
  const res = await ex.execute<Raw>(sql`
    select d.id, d.name, array_agg(distinct dr.revision order by dr.revision) as revisions,
      min(r.started_at) as first_run, max(r.started_at) as last_run, count(r.id)::int as runs
    from designs d join design_revisions dr on dr.design_id = d.id join runs r on r.design_revision_id = dr.id
    group by d.id, d.name order by count(r.id) desc, d.name`);
  return res.rows.map((r) => ({
    id: Number(r.id), name: String(r.name), revisions: (r.revisions as number[]).map(Number),
    firstRun: r.first_run ? new Date(r.first_run as string) : null, lastRun: r.last_run ? new Date(r.last_run as string) : null, runs: Number(r.runs),
  }));
}

/** The shifts runs were recorded under. */
export async function listShifts(ex: Executor = db()): Promise<string[]> {
  const res = await ex.execute<{ shift: string }>(sql`select distinct shift from runs where shift is not null order by shift`);
  return res.rows.map((r) => r.shift);
}
