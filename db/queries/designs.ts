import 'server-only';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { auditEvents, designRevisions, designs, runs, type DesignRevision } from '../schema';

export type NewDesignRevision = {
  /** The design file as uploaded ("fringelog.design/1"), already validated by analysis/design parseDesign. */
  document: unknown;
  name: string;
  referenceWavelengthNm: number;
  layerCount: number;
  sourceFileName?: string | null;
  createdBy: number | null;
  /** How the revision came: recorded in its audit entry. @default 'uploaded' */
  via?: 'uploaded' | 'imported' | 'edited';
};

/**
 * Stores a new revision of the design of that name (creating the design on its first revision),
 * with its audit entry, in one transaction. The design row is locked so two uploads cannot take
 * the same revision number.
 */
export async function createDesignRevision(input: NewDesignRevision, ex: Executor = db()): Promise<DesignRevision> {
  return ex.transaction(async (tx) => {
    await tx.insert(designs).values({ name: input.name, createdBy: input.createdBy }).onConflictDoNothing({ target: designs.name });
    const [design] = await tx.select().from(designs).where(eq(designs.name, input.name)).for('update');
    const [last] = await tx
      .select({ n: sql<number>`coalesce(max(${designRevisions.revision}), 0)::int` })
      .from(designRevisions)
      .where(eq(designRevisions.designId, design.id));
    const [revision] = await tx
      .insert(designRevisions)
      .values({
        designId: design.id,
        revision: (last?.n ?? 0) + 1,
        document: input.document,
        sourceFileName: input.sourceFileName ?? null,
        name: input.name,
        referenceWavelengthNm: input.referenceWavelengthNm,
        layerCount: input.layerCount,
        createdBy: input.createdBy,
      })
      .returning();
    await tx.insert(auditEvents).values({
      actorId: input.createdBy,
      action: 'design.revision_created',
      targetType: 'design',
      targetId: String(design.id),
      detail: { name: input.name, revision: revision.revision, via: input.via ?? 'uploaded' },
    });
    return revision;
  });
}

export async function findDesignRevision(id: number, ex: Executor = db()): Promise<DesignRevision | undefined> {
  const [row] = await ex.select().from(designRevisions).where(eq(designRevisions.id, id));
  return row;
}

/** The newest revision of the design of that name. */
export async function latestDesignRevision(name: string, ex: Executor = db()): Promise<DesignRevision | undefined> {
  const [row] = await ex
    .select({ revision: designRevisions })
    .from(designRevisions)
    .innerJoin(designs, eq(designs.id, designRevisions.designId))
    .where(eq(designs.name, name))
    .orderBy(desc(designRevisions.revision))
    .limit(1);
  return row?.revision;
}

export type DesignListRow = { id: number; name: string; revision: number; layerCount: number; referenceWavelengthNm: number; updatedAt: Date; runs: number };

/** Every design with its newest revision and how many runs use any of its revisions. */
export async function listDesigns(ex: Executor = db()): Promise<DesignListRow[]> {
  const result = await ex.execute<{ id: number; name: string; revision: number; layer_count: number; reference_wavelength_nm: number; updated_at: Date; runs: number }>(sql`
    select d.id, d.name, dr.revision, dr.layer_count, dr.reference_wavelength_nm, dr.created_at as updated_at,
           (select count(*)::int from runs r join design_revisions x on x.id = r.design_revision_id where x.design_id = d.id) as runs
    from designs d
    join lateral (select * from design_revisions where design_id = d.id order by revision desc limit 1) dr on true
    order by d.name`);
  return result.rows.map((r) => ({
    id: r.id,
    name: r.name,
    revision: r.revision,
    layerCount: r.layer_count,
    referenceWavelengthNm: r.reference_wavelength_nm,
    updatedAt: new Date(r.updated_at),
    runs: r.runs,
  }));
}

export type RevisionListRow = Pick<DesignRevision, 'id' | 'revision' | 'layerCount' | 'createdAt' | 'sourceFileName'> & { createdByName: string | null; runs: number };

/** A design and its revisions, newest first, each with the number of runs made with it. */
export async function findDesignWithRevisions(designId: number, ex: Executor = db()): Promise<{ id: number; name: string; revisions: RevisionListRow[] } | undefined> {
  const [design] = await ex.select().from(designs).where(eq(designs.id, designId));
  if (!design) return undefined;
  const result = await ex.execute<{ id: number; revision: number; layer_count: number; created_at: Date; source_file_name: string | null; created_by_name: string | null; runs: number }>(sql`
    select dr.id, dr.revision, dr.layer_count, dr.created_at, dr.source_file_name, u.name as created_by_name,
           (select count(*)::int from runs r where r.design_revision_id = dr.id) as runs
    from design_revisions dr left join users u on u.id = dr.created_by
    where dr.design_id = ${designId} order by dr.revision desc`);
  const revisions = result.rows.map((r) => ({
    id: r.id,
    revision: r.revision,
    layerCount: r.layer_count,
    createdAt: new Date(r.created_at),
    sourceFileName: r.source_file_name,
    createdByName: r.created_by_name,
    runs: r.runs,
  }));
  return { id: design.id, name: design.name, revisions };
}

/** One revision of a design by its number. */
export async function findRevisionOf(designId: number, revision: number, ex: Executor = db()): Promise<DesignRevision | undefined> {
  const [row] = await ex
    .select()
    .from(designRevisions)
    .where(and(eq(designRevisions.designId, designId), eq(designRevisions.revision, revision)));
  return row;
}

/** The runs made with one revision, newest first. */
export async function runsOfRevision(revisionId: number, ex: Executor = db()): Promise<{ id: number; runCode: string; startedAt: Date | null }[]> {
  return ex
    .select({ id: runs.id, runCode: runs.runCode, startedAt: runs.startedAt })
    .from(runs)
    .where(eq(runs.designRevisionId, revisionId))
    .orderBy(desc(runs.id));
}

/** Revision `revision` of the design of that name. */
export async function findDesignRevisionByNumber(name: string, revision: number, ex: Executor = db()): Promise<DesignRevision | undefined> {
  const [row] = await ex
    .select({ revision: designRevisions })
    .from(designRevisions)
    .innerJoin(designs, eq(designs.id, designRevisions.designId))
    .where(and(eq(designs.name, name), eq(designRevisions.revision, revision)));
  return row?.revision;
}

export type DesignRevisionChoice = { designName: string; revision: number; layerCount: number; createdAt: Date };

/** Every revision of every design, by name then newest revision first (the upload page's list). */
export async function listDesignRevisions(): Promise<DesignRevisionChoice[]> {
  return db()
    .select({ designName: designs.name, revision: designRevisions.revision, layerCount: designRevisions.layerCount, createdAt: designRevisions.createdAt })
    .from(designRevisions)
    .innerJoin(designs, eq(designs.id, designRevisions.designId))
    .orderBy(asc(designs.name), desc(designRevisions.revision));
}
