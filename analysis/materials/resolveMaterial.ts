import { materialLibrary } from './library';
import { type MaterialModel } from './schema';

export class UnknownMaterialError extends Error {
  constructor(
    readonly where: string,
    readonly materialName: string,
  ) {
    super(`${where}: unknown material "${materialName}" (built-in: ${Object.keys(materialLibrary).join(', ')})`);
    this.name = 'UnknownMaterialError';
  }
}

/**
 * A string names a built-in material; a model passes through. `where` is the key path used in
 * the error message (e.g. "materials.H").
 */
export function resolveMaterial(ref: string | MaterialModel, where: string): MaterialModel {
  if (typeof ref !== 'string') return ref;
  const hit = Object.hasOwn(materialLibrary, ref) ? materialLibrary[ref] : undefined;
  if (!hit) throw new UnknownMaterialError(where, ref);
  return hit.model;
}
