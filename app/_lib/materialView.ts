import 'server-only';
import { indexAt, materialLibrary, materialModelSchema, type LibraryMaterial, type MaterialModel } from '@/analysis/materials';
import { findShopMaterial } from '@/db/queries/materials';
import type { MaterialRow } from '@/db/schema';

/** A route segment back to the material name (names carry no "%", so decoding twice is harmless). */
export function nameParam(raw: string): string {
  try {
    return decodeURIComponent(raw);
  } catch {
    return raw;
  }
}

export type MaterialView =
  | { builtIn: false; row: MaterialRow; model: MaterialModel | null }
  | { builtIn: true; entry: LibraryMaterial; model: MaterialModel };

/** A shop material first, else the built-in entry of that name. */
export async function findMaterialView(name: string): Promise<MaterialView | null> {
  const row = await findShopMaterial(name);
  if (row) {
    const parsed = materialModelSchema.safeParse(row.model);
    return { builtIn: false, row, model: parsed.success ? parsed.data : null };
  }
  const entry = Object.hasOwn(materialLibrary, name) ? materialLibrary[name] : undefined;
  return entry ? { builtIn: true, entry, model: entry.model } : null;
}

/** n at a wavelength, or null outside the model's range. */
export function nAt(model: MaterialModel | null, wavelengthNm: number): number | null {
  if (!model) return null;
  try {
    return indexAt(model, wavelengthNm).re;
  } catch {
    return null;
  }
}

export const kindLabels: Record<LibraryMaterial['kind'], string> = {
  'published-fit': 'published fit',
  'typical-film': 'typical film',
  'from-memory': 'from memory',
  nominal: 'nominal',
};

/** The model in one line, e.g. "Cauchy A 1.45, B 0.0036 µm², C 0 µm⁴, k 0". */
export function modelSummary(m: MaterialModel): string {
  const range = m.validFromNm || m.validToNm ? `; valid ${m.validFromNm ?? 0}–${m.validToNm ?? '∞'} nm` : '';
  switch (m.model) {
    case 'constant':
      return `constant n ${m.n}, k ${m.k ?? 0}${range}`;
    case 'cauchy':
      return `Cauchy A ${m.A}, B ${m.B} µm², C ${m.C ?? 0} µm⁴, k ${m.k ?? 0}${range}`;
    case 'sellmeier':
      return `Sellmeier B ${m.B.join(', ')}; C ${m.C.join(', ')} µm${range}`;
    case 'table':
      return `table of ${m.points.length} rows, ${m.points[0][0]}–${m.points[m.points.length - 1][0]} nm${range}`;
  }
}
