'use client';

import { useActionState, useState } from 'react';
import { FormMessage, SubmitButton, formError, type FormAction } from '@/components/forms';
import { formatTime } from '@/components/ui/Page';
import { dispositionLooks, type DispositionValue } from './disposition';

type Props = {
  runId: number;
  current: { value: DispositionValue; reason: string | null; byName: string | null; at: Date | null } | null;
  /** Null when the signed-in role may not decide. */
  decide: FormAction | null;
};

/** The run's disposition at the top of its page, and for engineers and supervisors the form to set it. */
export function DispositionPanel({ runId, current, decide }: Props) {
  const [open, setOpen] = useState(false);
  const [state, act] = useActionState(async (prev: Parameters<FormAction>[0], form: FormData) => {
    const r = await decide!(prev, form);
    if (r.ok) setOpen(false);
    return r;
  }, null);
  const look = current ? dispositionLooks[current.value] : null;
  return (
    <section aria-labelledby="disposition-title" className="mb-6 rounded-md border border-paper-line bg-paper-raised p-4" data-testid="disposition">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 id="disposition-title" className="text-xs uppercase tracking-wider text-ink-faint">Disposition</h2>
          {current && look ? (
            <>
              <p className={`mt-1 inline-flex items-center gap-2 rounded-md border px-2.5 py-1 font-semibold ${look.box}`} data-testid="disposition-state">
                <span aria-hidden="true">{look.glyph}</span>
                {look.word}
              </p>
              <p className="mt-1 text-sm break-words whitespace-pre-wrap">{current.reason}</p>
              <p className="text-xs text-ink-faint">
                {current.byName ?? 'a former user'}
                {current.at ? ` · ${formatTime(current.at)}` : ''}
              </p>
            </>
          ) : (
            <p className="mt-1 text-sm text-ink-soft" data-testid="disposition-state">Not decided yet.</p>
          )}
        </div>
        {decide && !open ? (
          <button type="button" onClick={() => setOpen(true)} className="rounded-md border border-paper-line bg-paper px-3 py-1.5 text-sm font-medium hover:bg-paper-sunk">
            {current ? 'Change the disposition' : 'Decide the disposition'}
          </button>
        ) : null}
      </div>
      {!decide ? <p className="mt-2 text-xs text-ink-faint">Process engineers and supervisors decide a run&apos;s disposition.</p> : null}
      {decide && open ? (
        <form action={act} className="mt-3 flex flex-col gap-3 border-t border-paper-line pt-3">
          <input type="hidden" name="runId" value={runId} />
          <fieldset className="flex flex-wrap gap-2">
            <legend className="mb-1 text-sm font-medium text-ink-soft">Decision</legend>
            {(Object.keys(dispositionLooks) as DispositionValue[]).map((v) => (
              <label key={v} className="flex cursor-pointer items-center gap-2 rounded-md border border-paper-line px-3 py-1.5 text-sm has-[:checked]:border-fringe has-[:checked]:bg-fringe-light">
                <input type="radio" name="disposition" value={v} defaultChecked={current?.value === v} required />
                <span aria-hidden="true">{dispositionLooks[v].glyph}</span> {dispositionLooks[v].word}
              </label>
            ))}
          </fieldset>
          <label className="flex flex-col gap-1 text-sm font-medium text-ink-soft">
            Reason (required)
            <textarea name="reason" rows={3} required minLength={3} className="rounded-md border border-paper-line bg-paper-raised px-3 py-2 font-normal text-ink outline-none focus:border-fringe focus:ring-2 focus:ring-fringe/30" />
          </label>
          <p className="rounded-md border border-brass/40 bg-brass-light px-3 py-2 text-xs">
            Fringelog&apos;s figures are advisory. Whether a run ships is decided by your shop&apos;s own procedures and acceptance limits; record here what they decided.
          </p>
          {state && !state.ok ? <FormMessage tone="error">{formError(state) ?? Object.values(state.fieldErrors ?? {})[0]?.[0]}</FormMessage> : null}
          <div className="flex gap-2">
            <SubmitButton>Record the disposition</SubmitButton>
            <button type="button" onClick={() => setOpen(false)} className="text-sm text-ink-soft underline">Cancel</button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
