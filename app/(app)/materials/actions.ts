'use server';

import { redirect } from 'next/navigation';
import { revalidatePath } from 'next/cache';
import { z } from 'zod';
import { authorize } from '@/app/_lib/auth';
import { failure, fromZod, notAForm, type ActionResult } from '@/app/_lib/errors';
import { adoptFittedIndex, saveMaterial } from '@/app/_lib/materialService';

const inputSchema = z.object({ input: z.string().min(2).max(200_000) });

function readInput(form: FormData): { ok: true; value: unknown } | ReturnType<typeof failure> {
  const parsed = inputSchema.safeParse({ input: form.get('input') });
  if (!parsed.success) return fromZod(parsed.error);
  try {
    return { ok: true, value: JSON.parse(parsed.data.input) as unknown };
  } catch {
    return failure('bad_request:json');
  }
}

export async function createMaterial(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const input = readInput(form);
  if (!input.ok) return input;
  const auth = await authorize('editDesigns');
  if (!auth.ok) return auth;
  const saved = await saveMaterial(input.value, auth.user.id);
  if (!saved.ok) return saved;
  revalidatePath('/materials');
  redirect(`/materials/${encodeURIComponent(saved.data.name)}`);
}

export async function updateMaterial(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const input = readInput(form);
  if (!input.ok) return input;
  const name = z.string().min(1).safeParse(form.get('name'));
  if (!name.success) return fromZod(name.error);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return auth;
  const saved = await saveMaterial(input.value, auth.user.id, name.data);
  if (!saved.ok) return saved;
  revalidatePath('/materials');
  redirect(`/materials/${encodeURIComponent(saved.data.name)}`);
}

const adoptSchema = z.object({ name: z.string().min(1), wavelengthNm: z.coerce.number().positive() });

/** The runs' mean fitted index at one monitor wavelength becomes the material's nominal there. */
export async function adoptIndex(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = adoptSchema.safeParse({ name: form.get('name'), wavelengthNm: form.get('wavelengthNm') });
  if (!parsed.success) return fromZod(parsed.error);
  const auth = await authorize('editDesigns');
  if (!auth.ok) return auth;
  const saved = await adoptFittedIndex(parsed.data.name, parsed.data.wavelengthNm, auth.user.id);
  if (!saved.ok) return saved;
  revalidatePath(`/materials/${encodeURIComponent(parsed.data.name)}`);
  return { ok: true, data: undefined };
}
