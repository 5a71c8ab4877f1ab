'use client';

import { useActionState, useState } from 'react';
import { SubmitButton, type FormAction } from '@/components/forms';
import { errorsOf, formError } from '@/components/forms/types';

type Created = { token: string; hint: string; chamberName: string; label: string };

/** The new-token form; a created token is shown here once, with the curl line that uses it. */
export function CreateChamberTokenForm({ action, chambers, appUrl }: { action: FormAction<Created>; chambers: { id: number; name: string }[]; appUrl: string }) {
  const [state, formAction] = useActionState(action, null);
  const problem = formError(state);
  return (
    <div className="flex flex-col gap-4">
      <form action={formAction} className="grid gap-3 sm:grid-cols-[1fr_2fr_auto] sm:items-end">
        <div className="flex flex-col gap-1 text-sm font-medium text-ink-soft">
          <label htmlFor="token-chamber">Chamber</label>
          <select id="token-chamber" name="chamberId" className="rounded-md border border-paper-line bg-paper-raised px-3 py-2 text-ink" defaultValue="">
            <option value="">Choose…</option>
            {chambers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
          {errorsOf(state, 'chamberId') ? <span className="text-sm text-alarm">{errorsOf(state, 'chamberId')?.join(' ')}</span> : null}
        </div>
        <div className="flex flex-col gap-1 text-sm font-medium text-ink-soft">
          <label htmlFor="token-label">Used by</label>
          <input id="token-label" name="label" placeholder="Bay 1 controller PC" className="rounded-md border border-paper-line bg-paper-raised px-3 py-2 text-ink" />
          {errorsOf(state, 'label') ? <span className="text-sm text-alarm">{errorsOf(state, 'label')?.join(' ')}</span> : null}
        </div>
        <SubmitButton>Create token</SubmitButton>
      </form>
      {problem ? (
        <p role="alert" className="text-sm text-alarm">
          {problem}
        </p>
      ) : null}
      {state?.ok ? (
        <div className="rounded-md border border-film/40 bg-film-light p-4 text-sm" data-testid="new-token">
          <p className="font-medium">
            Token for {state.data.chamberName} ({state.data.label}). Copy it now: it is not shown again, and only its hash is kept.
          </p>
          <p className="mt-2 rounded bg-paper-raised px-2 py-1 font-mono text-xs break-all select-all" data-testid="token-value">
            {state.data.token}
          </p>
          <p className="mt-3 text-xs text-ink-soft">The controller PC uploads each finished run with:</p>
          <pre className="mt-1 overflow-x-auto rounded bg-ink px-3 py-2 font-mono text-xs text-paper-raised">{`curl -H "Authorization: Bearer ${state.data.token}" \\
  -F design="…design name…" -F trace=@run.csv ${appUrl}/api/runs`}</pre>
        </div>
      ) : null}
    </div>
  );
}

/** Revoke asks once more, naming the token, before it acts. */
export function RevokeChamberToken({ action, tokenId, hint, label }: { action: FormAction; tokenId: number; hint: string; label: string }) {
  const [state, formAction] = useActionState(action, null);
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <button type="button" onClick={() => setAsking(true)} className="rounded-md border border-alarm/40 px-3 py-1 text-sm text-alarm hover:bg-alarm-light">
        Revoke…
      </button>
    );
  }
  return (
    <form action={formAction} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="tokenId" value={tokenId} />
      <span className="text-xs text-ink-soft">
        Revoke {hint} ({label})? Uploads with it stop at once.
      </span>
      <SubmitButton variant="danger">Revoke token</SubmitButton>
      <button type="button" onClick={() => setAsking(false)} className="rounded-md border border-paper-line px-3 py-1 text-sm">
        Keep it
      </button>
      {state && !state.ok ? <span className="text-xs text-alarm">{state.message}</span> : null}
    </form>
  );
}
