'use client';

import Link from 'next/link';
import { useActionState } from 'react';
import { errorsOf, Field, formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

export function SignInForm({ action }: { action: FormAction }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  return (
    <form action={formAction} className="flex flex-col gap-4" noValidate>
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <Field name="email" label="E-mail" type="email" autoComplete="username" errors={errorsOf(state, 'email')} required />
      <Field name="password" label="Password" type="password" autoComplete="current-password" errors={errorsOf(state, 'password')} required />
      <SubmitButton>Sign in</SubmitButton>
      <Link href="/reset-password" className="text-sm text-fringe underline-offset-2 hover:underline">
        Forgot your password?
      </Link>
    </form>
  );
}
