import { apiError, readJsonBody } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { builtInMaterialsJson, materialJson } from '@/app/_lib/designApi';
import { saveMaterial } from '@/app/_lib/materialService';
import { listShopMaterials } from '@/db/queries/materials';

export const dynamic = 'force-dynamic';

/** The shop's materials, then the built-in library (read-only, with source and kind). */
export async function GET(): Promise<Response> {
  const auth = await authorize('viewDesigns');
  if (!auth.ok) return apiError(auth);
  return Response.json({ materials: [...(await listShopMaterials()).map(materialJson), ...builtInMaterialsJson()] });
}

/** A new shop material: `{ name, model, description?, source? }`. Engineers and admins. */
export async function POST(request: Request): Promise<Response> {
  const body = await readJsonBody(request);
  if (!body.ok) return apiError(body);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return apiError(auth);
  const saved = await saveMaterial(body.value, auth.user.id);
  if (!saved.ok) return apiError(saved);
  return Response.json({ material: materialJson(saved.data) }, { status: 201 });
}
