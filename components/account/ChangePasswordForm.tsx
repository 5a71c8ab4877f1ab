'use client';

import { useActionState } from 'react';
import { errorsOf, Field, formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

export function ChangePasswordForm({ action }: { action: FormAction }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  return (
    <form action={formAction} className="flex max-w-md flex-col gap-4" noValidate key={state?.ok ? 'done' : 'edit'}>
      {state?.ok ? <FormMessage tone="success">Password changed. Your other sessions have been signed out.</FormMessage> : null}
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <Field name="current" label="Current password" type="password" autoComplete="current-password" errors={errorsOf(state, 'current')} required />
      <Field name="password" label="New password" type="password" autoComplete="new-password" hint="At least 10 characters, with a digit or symbol; at most 72 bytes (a plain letter takes 1, an accented one 2 or more)." errors={errorsOf(state, 'password')} required />
      <Field name="confirm" label="Repeat the new password" type="password" autoComplete="new-password" errors={errorsOf(state, 'confirm')} required />
      <div>
        <SubmitButton>Change password</SubmitButton>
      </div>
    </form>
  );
}
