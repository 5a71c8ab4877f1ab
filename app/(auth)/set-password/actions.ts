'use server';

import { redirect } from 'next/navigation';
import { hashPassword } from '@/db/password';
import { redeemToken } from '@/db/queries/tokens';
import { failure, formObject, fromZod, notAForm, type ActionResult } from '@/app/_lib/errors';
import { setPasswordSchema } from '@/app/_lib/schemas';
import { hashToken, tokenProblemMessage } from '@/app/_lib/tokens';

export async function setPasswordWithToken(_prev: ActionResult | null, form: FormData): Promise<ActionResult> {
  if (!(form instanceof FormData)) return notAForm();
  const parsed = setPasswordSchema.safeParse(formObject(form));
  if (!parsed.success) return fromZod(parsed.error);
  const result = await redeemToken(hashToken(parsed.data.token), await hashPassword(parsed.data.password));
  if (!result.ok) return failure('bad_request:input', tokenProblemMessage(result.problem));
  redirect('/sign-in?notice=password-set');
}
