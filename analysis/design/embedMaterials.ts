import { materialLibrary } from '../materials/library';
import { type MaterialModel } from '../materials/schema';

type Doc = Record<string, unknown>;

/**
 * Writes the models of the shop's own materials into a design document so it parses on its own
 * forever: every layer material, `materials` entry, substrate or ambient that names a shop
 * material (not a built-in, not already a model in the file) becomes that material's model now,
 * and `materialOrigins` records which shop material each came from. A copy made by an earlier
 * save is taken again from the shop (a new revision uses the material as it is now; the old
 * revision keeps its copy). Built-in names stay names.
 * Anything that is not an object is returned as it is, for parseDesign to refuse with its key.
 */
export function embedMaterials(document: unknown, shopModel: (name: string) => MaterialModel | undefined): unknown {
  if (typeof document !== 'object' || document === null || Array.isArray(document)) return document;
  const doc: Doc = structuredClone(document) as Doc;
  const isShop = (ref: unknown): ref is string => typeof ref === 'string' && !Object.hasOwn(materialLibrary, ref) && shopModel(ref) !== undefined;
  const materials: Record<string, unknown> =
    typeof doc.materials === 'object' && doc.materials !== null && !Array.isArray(doc.materials) ? { ...(doc.materials as Doc) } : {};
  const origins: Record<string, string> =
    typeof doc.materialOrigins === 'object' && doc.materialOrigins !== null ? { ...(doc.materialOrigins as Record<string, string>) } : {};

  for (const [key, ref] of Object.entries(materials)) {
    const origin = Object.hasOwn(origins, key) ? origins[key] : undefined;
    if (isShop(ref)) {
      materials[key] = shopModel(ref);
      origins[key] = ref;
    } else if (typeof ref === 'object' && origin !== undefined && shopModel(origin) !== undefined) {
      materials[key] = shopModel(origin);
    }
  }
  if (Array.isArray(doc.layers)) {
    for (const layer of doc.layers as unknown[]) {
      const name = (layer as Doc | null)?.material;
      if (typeof name === 'string' && !Object.hasOwn(materials, name) && isShop(name)) {
        materials[name] = shopModel(name);
        origins[name] = name;
      }
    }
  }
  for (const key of ['substrate', 'ambient'] as const) {
    if (isShop(doc[key])) {
      origins[key] = doc[key];
      doc[key] = shopModel(doc[key]);
    } else if (typeof doc[key] === 'object' && Object.hasOwn(origins, key) && shopModel(origins[key]) !== undefined) {
      doc[key] = shopModel(origins[key]);
    }
  }
  if (Object.keys(materials).length) doc.materials = materials;
  if (Object.keys(origins).length) doc.materialOrigins = origins;
  return doc;
}
