'use client';

import { useActionState } from 'react';
import { SubmitButton, type FormAction } from '@/components/forms';

type RoleOption = { value: string; label: string };

function Problem({ state }: { state: Awaited<ReturnType<FormAction>> | null }) {
  return state && !state.ok ? (
    <p role="alert" className="mt-1 text-xs text-alarm">
      {state.message}
    </p>
  ) : null;
}

export function RoleControl({ action, userId, role, roles }: { action: FormAction; userId: number; role: string; roles: RoleOption[] }) {
  const [state, formAction] = useActionState(action, null);
  return (
    <form action={formAction} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <select name="role" defaultValue={role} aria-label="Role" className="rounded-md border border-paper-line bg-paper-raised px-2 py-1 text-sm">
        {roles.map((r) => (
          <option key={r.value} value={r.value}>
            {r.label}
          </option>
        ))}
      </select>
      <SubmitButton variant="quiet">Set role</SubmitButton>
      <Problem state={state} />
    </form>
  );
}

export function ActiveControl({ action, userId, active }: { action: FormAction; userId: number; active: boolean }) {
  const [state, formAction] = useActionState(action, null);
  return (
    <form action={formAction}>
      <input type="hidden" name="userId" value={userId} />
      <input type="hidden" name="active" value={active ? 'false' : 'true'} />
      <SubmitButton variant={active ? 'danger' : 'quiet'}>{active ? 'Deactivate' : 'Reactivate'}</SubmitButton>
      <Problem state={state} />
    </form>
  );
}

export function ResendInviteControl({ action, userId }: { action: FormAction; userId: number }) {
  const [state, formAction] = useActionState(action, null);
  return (
    <form action={formAction}>
      <input type="hidden" name="userId" value={userId} />
      <SubmitButton variant="quiet">{state?.ok ? 'Link sent' : 'Send new link'}</SubmitButton>
      <Problem state={state} />
    </form>
  );
}
