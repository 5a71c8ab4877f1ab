import 'server-only';
import { DesignFormatError, embedMaterials, parseDesign, type Design } from '@/analysis/design';
import { materialModelSchema, type MaterialModel } from '@/analysis/materials';
import { createDesignRevision } from '@/db/queries/designs';
import { listShopMaterials } from '@/db/queries/materials';
import type { DesignRevision } from '@/db/schema';
import { failure, unexpected, type ActionResult } from './errors';

/** The shop's materials by name, as models (a row whose model no longer validates is left out). */
export async function shopMaterialLookup(): Promise<(name: string) => MaterialModel | undefined> {
  const byName = new Map<string, MaterialModel>();
  for (const row of await listShopMaterials()) {
    const parsed = materialModelSchema.safeParse(row.model);
    if (parsed.success) byName.set(row.name, parsed.data);
  }
  return (name) => byName.get(name);
}

export type PreparedDesign = { document: unknown; design: Design };

/** A design document with the shop's materials written in, parsed; a fault names its key as the field. */
export async function prepareDesign(document: unknown, fileName?: string): Promise<ActionResult<PreparedDesign>> {
  const embedded = embedMaterials(document, await shopMaterialLookup());
  try {
    return { ok: true, data: { document: embedded, design: parseDesign(embedded, fileName) } };
  } catch (e) {
    if (e instanceof DesignFormatError) {
      const key = e.path === '' ? 'document' : e.path;
      return failure('bad_request:design', e.message, { [key]: [e.detail] });
    }
    return unexpected('design parse', e);
  }
}

/**
 * Stores a design document as a new revision (a new design when the name is new). With `name`,
 * the document is saved under that design whatever name it carries. Nothing is stored when the
 * document has a fault.
 */
export async function saveDesignRevision(
  document: unknown,
  userId: number,
  options: { name?: string; fileName?: string; via: 'imported' | 'edited' },
): Promise<ActionResult<DesignRevision>> {
  const named = options.name && typeof document === 'object' && document !== null && !Array.isArray(document) ? { ...document, name: options.name } : document;
  const prepared = await prepareDesign(named, options.fileName);
  if (!prepared.ok) return prepared;
  const { document: stored, design } = prepared.data;
  if (!design.name.trim()) return failure('bad_request:design', 'The design needs a name.', { name: ['must not be empty'] });
  try {
    const revision = await createDesignRevision({
      document: stored,
      name: design.name,
      referenceWavelengthNm: design.referenceWavelengthNm,
      layerCount: design.layers.length,
      sourceFileName: options.fileName ?? null,
      createdBy: userId,
      via: options.via,
    });
    return { ok: true, data: revision };
  } catch (e) {
    return unexpected('design revision', e);
  }
}
