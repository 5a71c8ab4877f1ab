import 'server-only';
import { asc, eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { auditEvents, materials, type MaterialRow } from '../schema';

export type MaterialInput = { name: string; model: unknown; description: string; source: string };

export async function listShopMaterials(ex: Executor = db()): Promise<MaterialRow[]> {
  return ex.select().from(materials).orderBy(asc(materials.name));
}

export async function findShopMaterial(name: string, ex: Executor = db()): Promise<MaterialRow | undefined> {
  const [row] = await ex.select().from(materials).where(eq(materials.name, name));
  return row;
}

/** Creates a shop material with its audit entry; null when the name is taken. */
export async function createShopMaterial(input: MaterialInput, actorId: number, ex: Executor = db()): Promise<MaterialRow | null> {
  return ex.transaction(async (tx) => {
    const [row] = await tx
      .insert(materials)
      .values({ ...input, createdBy: actorId, updatedBy: actorId })
      .onConflictDoNothing({ target: materials.name })
      .returning();
    if (!row) return null;
    await tx.insert(auditEvents).values({ actorId, action: 'material.created', targetType: 'material', targetId: String(row.id), detail: { name: row.name, model: input.model } });
    return row;
  });
}

/**
 * Changes a shop material (model, description, source) with its audit entry (model before and
 * after) in one transaction; null when there is no such material. Design revisions already saved
 * keep the copy they carry.
 */
export async function updateShopMaterial(
  name: string,
  change: Omit<MaterialInput, 'name'>,
  actorId: number,
  audit: { action: 'material.updated' | 'material.index_adopted'; detail?: Record<string, unknown> } = { action: 'material.updated' },
  ex: Executor = db(),
): Promise<MaterialRow | null> {
  return ex.transaction(async (tx) => {
    const [before] = await tx.select().from(materials).where(eq(materials.name, name)).for('update');
    if (!before) return null;
    const [row] = await tx
      .update(materials)
      .set({ ...change, updatedBy: actorId, updatedAt: new Date() })
      .where(eq(materials.id, before.id))
      .returning();
    await tx.insert(auditEvents).values({
      actorId,
      action: audit.action,
      targetType: 'material',
      targetId: String(row.id),
      detail: { name, before: before.model, after: change.model, ...audit.detail },
    });
    return row;
  });
}

export type FittedIndex = { wavelengthNm: number; runs: number; layers: number; mean: number; sd: number | null; meanSigma: number };

/**
 * The index the shop's runs measured for a material, per monitor wavelength: the layers of the
 * newest finished analysis of each run (its joint re-fit where there is one) whose design layer
 * used the material: by its own name, by a `materials` entry naming it, or by a copy recorded
 * in `materialOrigins`.
 */
export async function fittedIndexOf(name: string, ex: Executor = db()): Promise<FittedIndex[]> {
  const result = await ex.execute<{ wavelength_nm: number; runs: number; layers: number; mean: number; sd: number | null; mean_sigma: number }>(sql`
    with newest as (
      select distinct on (a.run_id) a.id, a.run_id
      from analyses a where a.state = 'done'
      order by a.run_id, (a.mode = 'refit') desc, a.id desc
    ), used as (
      select n.run_id, lr.index, lr.index_sigma,
             (dr.document->'layers'->(lr.layer - 1)->'monitor'->>'wavelengthNm')::float8 as wavelength_nm,
             coalesce(
               dr.document->'materialOrigins'->>lr.material,
               case when jsonb_typeof(dr.document->'materials'->lr.material) = 'string' then dr.document->'materials'->>lr.material end,
               lr.material) as material
      from newest n
      join layer_results lr on lr.analysis_id = n.id
      join runs r on r.id = n.run_id
      join design_revisions dr on dr.id = r.design_revision_id
    )
    select wavelength_nm, count(distinct run_id)::int as runs, count(*)::int as layers,
           avg(index)::float8 as mean, stddev_samp(index)::float8 as sd, avg(index_sigma)::float8 as mean_sigma
    from used where material = ${name} and wavelength_nm is not null
    group by wavelength_nm order by wavelength_nm`);
  return result.rows.map((r) => ({ wavelengthNm: r.wavelength_nm, runs: r.runs, layers: r.layers, mean: r.mean, sd: r.sd, meanSigma: r.mean_sigma }));
}
