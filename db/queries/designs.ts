import 'server-only';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { auditEvents, designRevisions, designs, type DesignRevision } from '../schema';

export type NewDesignRevision = {
  /** The design file as uploaded ("fringelog.design/1"), already validated by analysis/design parseDesign. */
  document: unknown;
  name: string;
  referenceWavelengthNm: number;
  layerCount: number;
  sourceFileName?: string | null;
  createdBy: number | null;
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
      detail: { name: input.name, revision: revision.revision },
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
