'use client';

import { useActionState } from 'react';
import { formError, FormMessage, SubmitButton, type FormAction } from '@/components/forms';

export function AlertPreferencesForm({ action, current }: { action: FormAction; current: { outOfTolerance: boolean; controlRules: boolean; shiftDigest: boolean } }) {
  const [state, formAction] = useActionState(action, null);
  const message = formError(state);
  return (
    <form action={formAction} className="flex max-w-xl flex-col gap-3 text-sm" data-testid="alert-preferences">
      {state?.ok ? <FormMessage tone="success">Alert choices saved.</FormMessage> : null}
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <label className="flex items-start gap-2">
        <input type="checkbox" name="outOfTolerance" defaultChecked={current.outOfTolerance} className="mt-1" />
        <span>
          E-mail me when an analysed run has a layer out of tolerance
          <span className="block text-ink-faint">thickness, index or cut error beyond the layer&apos;s limit (its own, the design&apos;s, or the shop default)</span>
        </span>
      </label>
      <label className="flex items-start gap-2">
        <input type="checkbox" name="controlRules" defaultChecked={current.controlRules} className="mt-1" />
        <span>
          E-mail me when a run fires a control-chart rule
          <span className="block text-ink-faint">Western Electric rules on its chamber&apos;s runs of the same design, limits from the 20 runs before it</span>
        </span>
      </label>
      <label className="flex items-start gap-2">
        <input type="checkbox" name="shiftDigest" defaultChecked={current.shiftDigest} className="mt-1" />
        <span>
          E-mail me a digest when each shift ends
          <span className="block text-ink-faint">the shift&apos;s runs with their worst cut and flags; nothing is sent for a shift without runs</span>
        </span>
      </label>
      <div>
        <SubmitButton>Save alert choices</SubmitButton>
      </div>
    </form>
  );
}
