import 'server-only';
import { materialLibrary } from '@/analysis/materials';
import { findDesignWithRevisions, findRevisionOf } from '@/db/queries/designs';
import type { DesignRevision, MaterialRow } from '@/db/schema';
import { failure } from './errors';

/** A path segment as a positive whole number, or null. */
export function idParam(value: string | null | undefined): number | null {
  if (!value || !/^\d{1,9}$/.test(value)) return null;
  const n = Number(value);
  return n > 0 ? n : null;
}

/** A design and one of its revisions (the newest without `revision`). */
export async function designAndRevision(designIdParam: string, revisionParam?: string | null) {
  const designId = idParam(designIdParam);
  const design = designId ? await findDesignWithRevisions(designId) : undefined;
  if (!design || design.revisions.length === 0) return failure('not_found:design');
  const number = revisionParam === undefined || revisionParam === null ? design.revisions[0].revision : idParam(revisionParam);
  const revision = number ? await findRevisionOf(design.id, number) : undefined;
  if (!revision) return failure('not_found:design', `Design ${design.name} has no revision ${revisionParam}.`);
  return { ok: true as const, design, revision };
}

export function revisionJson(r: DesignRevision) {
  return { id: r.id, revision: r.revision, name: r.name, layerCount: r.layerCount, referenceWavelengthNm: r.referenceWavelengthNm, createdAt: r.createdAt, document: r.document };
}

export function materialJson(m: MaterialRow) {
  return { name: m.name, builtIn: false, model: m.model, description: m.description, source: m.source, updatedAt: m.updatedAt };
}

export function builtInMaterialsJson() {
  return Object.values(materialLibrary).map((m) => ({ name: m.name, builtIn: true, model: m.model, description: m.description, source: m.source, kind: m.kind }));
}
