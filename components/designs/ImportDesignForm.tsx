'use client';

import { useActionState } from 'react';
import { errorsOf, FormMessage, SubmitButton, formError, type FormAction } from '@/components/forms';

/** Upload of a "fringelog.design/1" file; a fault is shown with the key it is in. */
export function ImportDesignForm({ action }: { action: FormAction }) {
  const [state, formAction] = useActionState(action, null);
  const fileErrors = errorsOf(state, 'file');
  const message = formError(state);
  return (
    <form action={formAction} className="flex flex-col gap-3" data-testid="import-design">
      <label htmlFor="design-file" className="text-sm font-medium text-ink-soft">
        Design file (fringelog.design/1, .json)
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <input
          id="design-file"
          name="file"
          type="file"
          accept=".json,application/json"
          aria-invalid={Boolean(fileErrors)}
          aria-describedby={fileErrors ? 'design-file-error' : undefined}
          className="text-sm"
        />
        <SubmitButton>Import</SubmitButton>
      </div>
      {fileErrors ? (
        <p id="design-file-error" role="alert" className="text-sm break-words text-alarm" data-field-error="file">
          {fileErrors.join(' ')}
        </p>
      ) : null}
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <p className="text-xs text-ink-faint">A name already in the list becomes that design&apos;s next revision; a new name, a new design.</p>
    </form>
  );
}
