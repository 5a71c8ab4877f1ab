'use client';

import { useActionState } from 'react';
import { errorsOf, Field, formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

type RoleOption = { value: string; label: string };

export function InviteUserForm({ action, roles }: { action: FormAction<{ userId: number }>; roles: RoleOption[] }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  const roleErrors = errorsOf(state, 'role');
  return (
    <form action={formAction} className="grid gap-4 md:grid-cols-[1fr_1fr_12rem_auto] md:items-start" noValidate key={state?.ok ? `sent-${state.data.userId}` : 'edit'}>
      <div className="md:col-span-4">
        {state?.ok ? <FormMessage tone="success">Invitation sent. The link is valid for 72 hours and works once.</FormMessage> : null}
        {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      </div>
      <Field name="name" label="Name" autoComplete="off" errors={errorsOf(state, 'name')} required />
      <Field name="email" label="E-mail" type="email" autoComplete="off" errors={errorsOf(state, 'email')} required />
      <div className="flex flex-col gap-1">
        <label htmlFor="field-role" className="text-sm font-medium text-ink-soft">
          Role
        </label>
        <select id="field-role" name="role" defaultValue="operator" className="rounded-md border border-paper-line bg-paper-raised px-3 py-2">
          {roles.map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </select>
        {roleErrors ? <p className="text-sm text-alarm">{roleErrors.join(' ')}</p> : null}
      </div>
      <div className="md:pt-6">
        <SubmitButton>Send invitation</SubmitButton>
      </div>
    </form>
  );
}
