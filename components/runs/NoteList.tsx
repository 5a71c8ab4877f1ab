'use client';

import { useActionState, useState } from 'react';
import { FormMessage, SubmitButton, formError, type FormAction } from '@/components/forms';
import { formatTime } from '@/components/ui/Page';
import { fixed } from './format';

export type NoteView = { id: number; authorId: number | null; authorName: string | null; body: string; createdAt: Date; updatedAt: Date; timeS: number | null; layer: number | null };

const area = 'w-full rounded-md border border-paper-line bg-paper-raised px-3 py-2 text-sm outline-none focus:border-fringe focus:ring-2 focus:ring-fringe/30';

export function pinLabel(n: { timeS: number | null; layer: number | null }): string {
  return [n.layer !== null ? `layer ${n.layer}` : null, n.timeS !== null ? `${fixed(n.timeS, 1)} s` : null].filter(Boolean).join(' · ');
}

function OwnControls({ note, kind, runId, change }: { note: NoteView; kind: 'annotation' | 'comment'; runId: number; change: FormAction }) {
  const [editing, setEditing] = useState(false);
  const [state, act] = useActionState(async (prev: Parameters<FormAction>[0], form: FormData) => {
    const r = await change(prev, form);
    if (r.ok) setEditing(false);
    return r;
  }, null);
  const hidden = (
    <>
      <input type="hidden" name="runId" value={runId} />
      <input type="hidden" name="noteId" value={note.id} />
      <input type="hidden" name="kind" value={kind} />
    </>
  );
  return (
    <div className="mt-1">
      {editing ? (
        <form action={act} className="flex flex-col gap-2">
          {hidden}
          <label className="sr-only" htmlFor={`edit-${kind}-${note.id}`}>Edit the text</label>
          <textarea id={`edit-${kind}-${note.id}`} name="body" defaultValue={note.body} rows={2} className={area} />
          <div className="flex gap-2">
            <SubmitButton variant="quiet">Save</SubmitButton>
            <button type="button" className="text-sm text-ink-soft underline" onClick={() => setEditing(false)}>Cancel</button>
          </div>
        </form>
      ) : (
        <div className="flex gap-3 text-xs">
          <button type="button" className="text-fringe underline-offset-2 hover:underline" onClick={() => setEditing(true)}>Edit</button>
          <form action={act}>
            {hidden}
            <button type="submit" className="text-alarm underline-offset-2 hover:underline">Delete</button>
          </form>
        </div>
      )}
      {formError(state) ? <FormMessage tone="error">{formError(state)}</FormMessage> : null}
    </div>
  );
}

/** Notes or comments with author and time; the author's own carry Edit and Delete. */
export function NoteList({ notes, kind, runId, me, change, numbered = false, empty }: { notes: NoteView[]; kind: 'annotation' | 'comment'; runId: number; me: number | null; change: FormAction | null; numbered?: boolean; empty: string }) {
  if (notes.length === 0) return <p className="text-sm text-ink-soft">{empty}</p>;
  return (
    <ol className="flex flex-col divide-y divide-paper-line" data-testid={`${kind}-list`}>
      {notes.map((n, i) => (
        <li key={n.id} className="py-2 text-sm">
          <p className="text-xs text-ink-faint">
            {numbered ? <span className="mr-1 inline-block rounded bg-film px-1.5 font-mono text-paper-raised">{i + 1}</span> : null}
            {kind === 'annotation' ? <span className="mr-2 font-medium text-film">{pinLabel(n)}</span> : null}
            <span className="font-medium text-ink-soft">{n.authorName ?? 'a former user'}</span> · {formatTime(n.createdAt)}
            {n.updatedAt.getTime() - n.createdAt.getTime() > 1000 ? ' · edited' : ''}
          </p>
          <p className="mt-0.5 whitespace-pre-wrap break-words">{n.body}</p>
          {change && me !== null && n.authorId === me ? <OwnControls note={n} kind={kind} runId={runId} change={change} /> : null}
        </li>
      ))}
    </ol>
  );
}

/** The comment box under the thread. */
export function CommentForm({ runId, add }: { runId: number; add: FormAction<{ id: number }> }) {
  const [state, act] = useActionState(add, null);
  return (
    <form action={act} className="mt-3 flex flex-col gap-2" key={state?.ok ? state.data.id : 'new'}>
      <input type="hidden" name="runId" value={runId} />
      <label htmlFor="comment-body" className="text-sm font-medium text-ink-soft">Add to the discussion</label>
      <textarea id="comment-body" name="body" rows={3} className={area} required />
      {formError(state) ? <FormMessage tone="error">{formError(state)}</FormMessage> : null}
      {state && !state.ok && state.fieldErrors?.body ? <FormMessage tone="error">{state.fieldErrors.body[0]}</FormMessage> : null}
      <div><SubmitButton>Post comment</SubmitButton></div>
    </form>
  );
}
