'use client';

import { useActionState } from 'react';
import { errorsOf, Field, formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

export function ResetRequestForm({ action }: { action: FormAction<{ email: string }> }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  if (state?.ok) {
    return (
      <FormMessage tone="success">
        If <strong>{state.data.email}</strong> has an active account, a link to choose a new password is on its way. It works once, for one hour.
      </FormMessage>
    );
  }
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <Field name="email" label="E-mail" type="email" autoComplete="username" errors={errorsOf(state, 'email')} required />
      <SubmitButton>Send reset link</SubmitButton>
    </form>
  );
}
