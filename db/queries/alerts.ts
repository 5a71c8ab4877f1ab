import 'server-only';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { alertPreferences, users, type AlertPreferences, type Role } from '../schema';
import { layerFigures, layerLimits } from './compare';

export type AlertKind = 'outOfTolerance' | 'controlRules' | 'shiftDigest';

const column = { outOfTolerance: alertPreferences.outOfTolerance, controlRules: alertPreferences.controlRules, shiftDigest: alertPreferences.shiftDigest } as const;

export async function findAlertPreferences(userId: number, ex: Executor = db()): Promise<Pick<AlertPreferences, AlertKind>> {
  const [row] = await ex.select().from(alertPreferences).where(eq(alertPreferences.userId, userId));
  return { outOfTolerance: row?.outOfTolerance ?? false, controlRules: row?.controlRules ?? false, shiftDigest: row?.shiftDigest ?? false };
}

export async function saveAlertPreferences(userId: number, prefs: Pick<AlertPreferences, AlertKind>, ex: Executor = db()): Promise<void> {
  await ex
    .insert(alertPreferences)
    .values({ userId, ...prefs })
    .onConflictDoUpdate({ target: alertPreferences.userId, set: { ...prefs, updatedAt: new Date() } });
}

/** Active users of the given roles who asked for this kind of alert. */
export async function alertRecipients(kind: AlertKind, roles: Role[], ex: Executor = db()): Promise<{ id: number; name: string; email: string }[]> {
  if (roles.length === 0) return [];
  return ex
    .select({ id: users.id, name: users.name, email: users.email })
    .from(users)
    .innerJoin(alertPreferences, eq(alertPreferences.userId, users.id))
    .where(and(eq(users.status, 'active'), inArray(users.role, roles), eq(column[kind], true)))
    .orderBy(users.id);
}

export type AnalysisForAlert = {
  analysisId: number;
  mode: 'refit' | 'sequential';
  runId: number;
  runCode: string;
  chamberId: number;
  chamberName: string;
  shift: string | null;
  startedAt: Date | null;
  designId: number;
  designName: string;
  revision: number;
};

/** A finished analysis with its run, chamber and design, for an alert. */
export async function findAnalysisForAlert(analysisId: number, ex: Executor = db()): Promise<AnalysisForAlert | undefined> {
  const res = await ex.execute<Record<string, unknown>>(sql`
    select a.id, a.mode, r.id as run_id, r.run_code, r.chamber_id, c.name as chamber, r.shift, r.started_at, p.design_id, p.name as design, p.revision
    from analyses a join runs r on r.id = a.run_id join chambers c on c.id = r.chamber_id join design_revisions p on p.id = r.design_revision_id
    where a.id = ${analysisId} and a.state = 'done'`);
  const r = res.rows[0];
  if (!r) return undefined;
  return {
    analysisId: Number(r.id), mode: r.mode as AnalysisForAlert['mode'], runId: Number(r.run_id), runCode: String(r.run_code), chamberId: Number(r.chamber_id),
    chamberName: String(r.chamber), shift: (r.shift as string | null) ?? null, startedAt: r.started_at ? new Date(r.started_at as string) : null,
    designId: Number(r.design_id), designName: String(r.design), revision: Number(r.revision),
  };
}

export type FlaggedLayer = { layer: number; material: string; figure: 'thickness' | 'index' | 'cut'; value: number; limit: number };

/** The layers of an analysis beyond their tolerance, one row per figure out. */
export async function outOfToleranceLayers(analysisId: number, ex: Executor = db()): Promise<FlaggedLayer[]> {
  const res = await ex.execute<Record<string, unknown>>(sql`
    with ${layerLimits(sql`select r.design_revision_id from analyses a join runs r on r.id = a.run_id where a.id = ${analysisId}`)}, m as (
      select ${layerFigures()}, l.tol_thickness, l.tol_index, l.tol_cut from layer_results lr
      left join limits l on l.layer = lr.layer
      where lr.analysis_id = ${analysisId}
    )
    select layer, material, 'thickness' as figure, thickness as value, tol_thickness as lim from m where abs(thickness) > tol_thickness
    union all select layer, material, 'index', index_dev, tol_index from m where abs(index_dev) > tol_index
    union all select layer, material, 'cut', cut, tol_cut from m where abs(cut) > tol_cut
    order by 1, 3`);
  return res.rows.map((r) => ({ layer: Number(r.layer), material: String(r.material), figure: r.figure as FlaggedLayer['figure'], value: Number(r.value), limit: Number(r.lim) }));
}
