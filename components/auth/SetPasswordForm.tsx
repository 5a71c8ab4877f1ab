'use client';

import { useActionState } from 'react';
import { errorsOf, Field, formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

export function SetPasswordForm({ action, token, email }: { action: FormAction; token: string; email: string }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <input type="hidden" name="token" value={token} />
      <input type="hidden" name="username" value={email} autoComplete="username" />
      <Field name="password" label="New password" type="password" autoComplete="new-password" hint="At least 10 characters, with a digit or symbol; at most 72 bytes (a plain letter takes 1, an accented one 2 or more)." errors={errorsOf(state, 'password')} required />
      <Field name="confirm" label="Repeat the new password" type="password" autoComplete="new-password" errors={errorsOf(state, 'confirm')} required />
      <SubmitButton>Save password</SubmitButton>
    </form>
  );
}
