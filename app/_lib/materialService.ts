import 'server-only';
import { z } from 'zod';
import { adoptIndex, indexAt, materialLibrary, materialModelSchema } from '@/analysis/materials';
import { formatKeyPath } from '@/analysis/design';
import { createShopMaterial, fittedIndexOf, findShopMaterial, updateShopMaterial } from '@/db/queries/materials';
import type { MaterialRow } from '@/db/schema';
import { failure, fieldFailure, unexpected, type ActionResult, type FieldErrors } from './errors';

/** A shop material as a form or an API caller sends it. */
export const materialInputSchema = z.object({
  name: z
    .string()
    .trim()
    .min(1, 'Give the material a name.')
    .max(60, 'At most 60 characters.')
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ._+()-]*$/, 'Letters, digits, spaces and . _ + ( ) - only, starting with a letter or digit.')
    .refine((n) => !Object.hasOwn(materialLibrary, n), 'That is the name of a built-in material; choose another.'),
  description: z.string().trim().max(500, 'At most 500 characters.').default(''),
  source: z.string().trim().max(500, 'At most 500 characters.').default(''),
  model: materialModelSchema,
});
export type MaterialInputParsed = z.infer<typeof materialInputSchema>;

/** zod issues keyed the way the form names its fields: "name", "model.B", "model.points[2][0]". */
function keyed(error: z.ZodError): ReturnType<typeof failure> {
  const fieldErrors: FieldErrors = {};
  for (const issue of error.issues) {
    const key = formatKeyPath(issue.path) || 'model';
    (fieldErrors[key] ??= []).push(issue.message);
  }
  const first = error.issues[0];
  return failure('bad_request:input', `${formatKeyPath(first.path) || 'model'}: ${first.message}`, fieldErrors);
}

export function parseMaterialInput(input: unknown): ActionResult<MaterialInputParsed> {
  const r = materialInputSchema.safeParse(input);
  return r.success ? { ok: true, data: r.data } : keyed(r.error);
}

const materialChangeSchema = materialInputSchema.omit({ name: true });

function parseMaterialChange(input: unknown): ActionResult<Omit<MaterialInputParsed, 'name'>> {
  const r = materialChangeSchema.safeParse(input);
  return r.success ? { ok: true, data: r.data } : keyed(r.error);
}

/** Creates (no `existing`) or changes a shop material; the name of an existing one stays. */
export async function saveMaterial(input: unknown, userId: number, existing?: string): Promise<ActionResult<MaterialRow>> {
  // An existing material keeps its name: designs refer to it by name.
  const parsed = existing ? parseMaterialChange(input) : parseMaterialInput(input);
  if (!parsed.ok) return parsed;
  try {
    const row = existing ? await updateShopMaterial(existing, parsed.data, userId) : await createShopMaterial(parsed.data as MaterialInputParsed, userId);
    if (!row) return existing ? failure('not_found:material') : failure('conflict:material_name', undefined, { name: ['That name is already taken by another material.'] });
    return { ok: true, data: row };
  } catch (e) {
    return unexpected('material save', e);
  }
}

/**
 * Adopts the runs' fitted index at one monitor wavelength as the material's nominal there (its
 * model moved by analysis/materials adoptIndex), audited with the old and new value.
 */
export async function adoptFittedIndex(name: string, wavelengthNm: number, userId: number): Promise<ActionResult<MaterialRow>> {
  const row = await findShopMaterial(name);
  if (!row) return failure('not_found:material');
  const model = materialModelSchema.safeParse(row.model);
  if (!model.success) return failure('bad_request:input', 'The stored model of this material no longer validates; edit it first.');
  const fitted = (await fittedIndexOf(name)).find((f) => f.wavelengthNm === wavelengthNm);
  if (!fitted) return fieldFailure('wavelengthNm', `No run measured ${name} at ${wavelengthNm} nm.`);
  let moved;
  let previous;
  try {
    previous = indexAt(model.data, wavelengthNm).re;
    moved = adoptIndex(model.data, wavelengthNm, Number(fitted.mean.toFixed(4)));
  } catch (e) {
    return fieldFailure('wavelengthNm', (e as Error).message);
  }
  try {
    const updated = await updateShopMaterial(name, { model: moved, description: row.description, source: row.source }, userId, {
      action: 'material.index_adopted',
      detail: { wavelengthNm, index: Number(fitted.mean.toFixed(4)), previousIndex: Number(previous.toFixed(4)), runs: fitted.runs, layers: fitted.layers },
    });
    return updated ? { ok: true, data: updated } : failure('not_found:material');
  } catch (e) {
    return unexpected('material adopt', e);
  }
}
