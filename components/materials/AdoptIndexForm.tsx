'use client';

import { useActionState } from 'react';
import { FormMessage, SubmitButton, type FormAction } from '@/components/forms';

/** One button per monitor wavelength: the runs' fitted index becomes the nominal there. */
export function AdoptIndexForm({ action, name, wavelengthNm, index }: { action: FormAction; name: string; wavelengthNm: number; index: string }) {
  const [state, formAction] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-col items-end gap-1">
      <input type="hidden" name="name" value={name} />
      <input type="hidden" name="wavelengthNm" value={wavelengthNm} />
      <SubmitButton variant="quiet">Adopt n = {index}</SubmitButton>
      {state?.ok ? <FormMessage tone="success">Adopted; the audit log records it.</FormMessage> : null}
      {state && !state.ok ? <FormMessage tone="error">{state.fieldErrors?.wavelengthNm?.join(' ') ?? state.message}</FormMessage> : null}
    </form>
  );
}
