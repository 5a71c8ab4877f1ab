'use client';

import { useActionState, useMemo, useRef, useState } from 'react';
import { FormMessage, SubmitButton, formError, type FormAction } from '@/components/forms';
import { fixed } from './format';
import { LayerTable, type LayerView } from './LayerTable';
import { NoteList, type NoteView } from './NoteList';
import { TracePlot } from './TracePlot';
import type { TraceLayerSpan } from './traceMarks';
import type { SeriesPayload } from './useTraceSeries';

type Props = {
  runId: number;
  analysisId: number | null;
  overview: SeriesPayload | null;
  layers: LayerView[];
  spans: TraceLayerSpan[];
  annotations: NoteView[];
  me: number | null;
  addAnnotation: FormAction<{ id: number }> | null;
  changeNote: FormAction | null;
};

const input = 'w-full rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 text-sm outline-none focus:border-fringe focus:ring-2 focus:ring-fringe/30';

function Key() {
  return (
    <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft" aria-label="Key to the trace">
      <li><span className="mr-1 inline-block h-0.5 w-4 bg-ink/50 align-middle" />measured</li>
      <li><span className="mr-1 inline-block h-0.5 w-4 bg-fringe align-middle" />fitted model</li>
      <li><span className="text-leaf">●</span>/<span className="text-brass">▲</span>/<span className="text-alarm">■</span> cut (within, near, outside tolerance) ─ ○ where the fit puts it</li>
      <li><span className="mr-1 inline-block h-0.5 w-4 bg-brass align-middle" />planned trigger level</li>
      <li><span className="mr-1 inline-block h-3 w-0.5 bg-ink-soft align-middle" />chip change</li>
      <li><span className="mr-1 inline-block rounded bg-film px-1 text-paper-raised">1</span>note</li>
    </ul>
  );
}

/**
 * The trace, its notes and the layer table as one piece: a row shows its layer on the trace, a
 * click in a layer's band selects its row, and a click with pinning on (or n) pins a note.
 */
export function RunReview(p: Props) {
  const [selected, setSelected] = useState<number | null>(null);
  const [focus, setFocus] = useState<{ layer: number; nonce: number } | null>(null);
  const [pinning, setPinning] = useState(false);
  const [draft, setDraft] = useState<{ timeS: number | null; layer: number | null; nonce: number } | null>(null);
  const formBox = useRef<HTMLDivElement>(null);
  const pins = useMemo(() => p.annotations.map((a, i) => ({ id: a.id, timeS: a.timeS, layer: a.layer, number: i + 1 })), [p.annotations]);

  const zoomTo = (layer: number) => {
    setSelected(layer);
    setFocus((f) => ({ layer, nonce: (f?.nonce ?? 0) + 1 }));
  };
  const selectFromPlot = (layer: number) => {
    setSelected(layer);
    document.querySelector(`[data-layer="${layer}"]`)?.scrollIntoView({ block: 'nearest' });
  };
  const pin = (timeS: number, layer: number | null) => {
    if (!p.addAnnotation) return;
    setPinning(false);
    setDraft((d) => ({ timeS: Math.round(timeS * 10) / 10, layer, nonce: (d?.nonce ?? 0) + 1 }));
    requestAnimationFrame(() => formBox.current?.querySelector('textarea')?.focus());
  };

  const [state, act] = useActionState(async (prev: Parameters<FormAction<{ id: number }>>[0], form: FormData) => {
    const r = await p.addAnnotation!(prev, form);
    if (r.ok) setDraft(null);
    return r;
  }, null);

  return (
    <div className="flex flex-col gap-6">
      <section aria-label="Trace">
        <TracePlot
          runId={p.runId}
          analysisId={p.analysisId}
          initial={p.overview}
          spans={p.spans}
          pins={pins}
          selectedLayer={selected}
          focus={focus}
          pinning={pinning}
          onTogglePinning={() => setPinning((v) => !v && p.addAnnotation !== null)}
          onSelectLayer={selectFromPlot}
          onPin={pin}
        />
        <Key />
      </section>
      <section aria-labelledby="notes-title" className="grid gap-4 md:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="min-w-0">
          <h3 id="notes-title" className="mb-2 text-sm font-semibold">Notes on the trace</h3>
          <NoteList notes={p.annotations} kind="annotation" runId={p.runId} me={p.me} change={p.changeNote} numbered empty="No notes pinned yet." />
        </div>
        {p.addAnnotation ? (
          <div ref={formBox} className="min-w-0">
            <form action={act} key={draft?.nonce ?? 0} className="flex flex-col gap-2 rounded-md border border-paper-line bg-paper p-3" data-testid="annotation-form">
              <p className="text-sm font-medium text-ink-soft">{draft ? 'Pin a note here' : 'Pin a note to a time or a layer'}</p>
              <input type="hidden" name="runId" value={p.runId} />
              <div className="grid grid-cols-2 gap-2">
                <label className="text-xs text-ink-faint">
                  Time, s
                  <input name="timeS" type="number" step="0.1" min="0" defaultValue={draft?.timeS ?? ''} className={input} />
                </label>
                <label className="text-xs text-ink-faint">
                  Layer
                  <input name="layer" type="number" step="1" min="1" defaultValue={draft?.layer ?? ''} className={input} />
                </label>
              </div>
              <label className="text-xs text-ink-faint">
                Note
                <textarea name="body" rows={2} className={input} required />
              </label>
              {state && !state.ok ? <FormMessage tone="error">{formError(state) ?? Object.values(state.fieldErrors ?? {})[0]?.[0]}</FormMessage> : null}
              <div><SubmitButton>Pin note</SubmitButton></div>
              {draft?.timeS != null ? <p className="text-xs text-ink-faint">From the click at {fixed(draft.timeS, 1)} s.</p> : null}
            </form>
          </div>
        ) : null}
      </section>
      <section aria-label="Layers">
        <LayerTable layers={p.layers} selected={selected} onSelect={zoomTo} />
      </section>
    </div>
  );
}
