import 'server-only';
import { sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { layerFigures, layerLimits } from './compare';

export type DigestRun = {
  runId: number;
  runCode: string;
  designName: string;
  revision: number;
  chamberName: string;
  shift: string | null;
  operatorName: string | null;
  startedAt: Date | null;
  disposition: 'accepted' | 'on_hold' | 'rejected' | null;
  /** The run's newest finished analysis, if any. */
  analysisId: number | null;
  mode: 'refit' | 'sequential' | null;
  /** Its largest |cut error| (% QWOT), that layer, and the layer's cut limit. */
  worstCut: { layer: number; value: number; limit: number } | null;
  /** Its layers with any figure (thickness, index, cut) beyond the layer's limit. */
  layersOut: number[];
  /** Analyses of the run that failed within the window, with their messages. */
  failed: string[];
};

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

/**
 * The runs of a shift window: started in it, or with an analysis that finished (done or failed)
 * in it; each with its newest finished analysis's worst cut and out-of-tolerance layers, all
 * gathered in one statement. Ordered by start.
 */
export async function shiftDigestRuns(from: Date, to: Date, ex: Executor = db()): Promise<DigestRun[]> {
  const res = await ex.execute<Record<string, unknown>>(sql`
    with picked as (
      select r.id as run_id, r.run_code, r.shift, r.operator_name, r.started_at, r.disposition, r.design_revision_id as revision_id,
        c.name as chamber, dr.name as design, dr.revision
      from runs r join chambers c on c.id = r.chamber_id join design_revisions dr on dr.id = r.design_revision_id
      where (r.started_at >= ${from} and r.started_at < ${to})
        or exists (select 1 from analyses a where a.run_id = r.id and a.state in ('done', 'failed') and a.finished_at >= ${from} and a.finished_at < ${to})
    ), newest as (
      select distinct on (a.run_id) a.run_id, a.id as analysis_id, a.mode
      from analyses a join picked p on p.run_id = a.run_id
      where a.state = 'done' order by a.run_id, a.finished_at desc, a.id desc
    ), ${layerLimits(sql`select distinct revision_id from picked`)}, m as (
      select n.run_id, ${layerFigures()}, l.tol_thickness, l.tol_index, l.tol_cut
      from newest n join picked p on p.run_id = n.run_id join layer_results lr on lr.analysis_id = n.analysis_id
      left join limits l on l.revision_id = p.revision_id and l.layer = lr.layer
    ), worst as (
      select distinct on (run_id) run_id, layer, cut, tol_cut from m order by run_id, abs(cut) desc, layer
    ), outside as (
      select run_id, array_agg(layer order by layer) as layers from m
      where abs(thickness) > tol_thickness or abs(index_dev) > tol_index or abs(cut) > tol_cut group by run_id
    ), failures as (
      select a.run_id, array_agg(coalesce(a.error, 'no message') order by a.id) as errors from analyses a join picked p on p.run_id = a.run_id
      where a.state = 'failed' and a.finished_at >= ${from} and a.finished_at < ${to} group by a.run_id
    )
    select p.*, n.analysis_id, n.mode, w.layer as worst_layer, w.cut as worst_cut, w.tol_cut as worst_limit, o.layers as layers_out, f.errors
    from picked p left join newest n on n.run_id = p.run_id left join worst w on w.run_id = p.run_id
    left join outside o on o.run_id = p.run_id left join failures f on f.run_id = p.run_id
    order by p.started_at nulls last, p.run_code`);
  return res.rows.map((r) => ({
    runId: Number(r.run_id), runCode: String(r.run_code), designName: String(r.design), revision: Number(r.revision), chamberName: String(r.chamber),
    shift: (r.shift as string | null) ?? null, operatorName: (r.operator_name as string | null) ?? null,
    startedAt: r.started_at ? new Date(r.started_at as string) : null, disposition: (r.disposition as DigestRun['disposition']) ?? null,
    analysisId: num(r.analysis_id), mode: (r.mode as DigestRun['mode']) ?? null,
    worstCut: r.worst_layer === null || r.worst_layer === undefined ? null : { layer: Number(r.worst_layer), value: Number(r.worst_cut), limit: Number(r.worst_limit) },
    layersOut: ((r.layers_out as unknown[] | null) ?? []).map(Number), failed: ((r.errors as unknown[] | null) ?? []).map(String),
  }));
}
