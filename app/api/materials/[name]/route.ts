import { apiError, readJsonBody } from '@/app/_lib/apiResponse';
import { authorize } from '@/app/_lib/auth';
import { builtInMaterialsJson, materialJson } from '@/app/_lib/designApi';
import { failure } from '@/app/_lib/errors';
import { saveMaterial } from '@/app/_lib/materialService';
import { fittedIndexOf, findShopMaterial } from '@/db/queries/materials';

export const dynamic = 'force-dynamic';

type Ctx = { params: Promise<{ name: string }> };

/** A shop material with the index the shop's runs fitted for it, or a built-in entry. */
export async function GET(_request: Request, { params }: Ctx): Promise<Response> {
  const auth = await authorize('viewDesigns');
  if (!auth.ok) return apiError(auth);
  const name = decodeURIComponent((await params).name);
  const row = await findShopMaterial(name);
  if (row) return Response.json({ material: materialJson(row), fittedIndex: await fittedIndexOf(name) });
  const builtIn = builtInMaterialsJson().find((m) => m.name === name);
  if (builtIn) return Response.json({ material: builtIn, fittedIndex: await fittedIndexOf(name) });
  return apiError(failure('not_found:material'));
}

/** Changes a shop material's model, description and source (its name stays). Built-ins are read-only. */
export async function PUT(request: Request, { params }: Ctx): Promise<Response> {
  const body = await readJsonBody(request);
  if (!body.ok) return apiError(body);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return apiError(auth);
  const name = decodeURIComponent((await params).name);
  const saved = await saveMaterial(body.value, auth.user.id, name);
  if (!saved.ok) return apiError(saved);
  return Response.json({ material: materialJson(saved.data) });
}
