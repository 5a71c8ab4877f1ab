'use client';

import { startTransition, useActionState, useReducer } from 'react';
import { FormMessage } from '@/components/forms';
import type { FormAction } from '@/components/forms/types';
import { cell, FieldError, MaterialOptions, NumberCell, type MaterialChoices } from './editorCells';
import { editorReducer, fromDocument, toDocument, FROM_FILE, type EditorLayer } from './editorState';

export type { MaterialChoices };

type Props = { designId: number; document: unknown; materials: MaterialChoices; save: FormAction<undefined> };

/** "design: layers[1].thicknessNm: …" as the table numbers it: "Layer 2, thicknessNm: …". */
function readable(message: string): string {
  return message.replace(/^design: /, '').replace(/^layers\[(\d+)\]\.?/, (_m, i: string) => `Layer ${Number(i) + 1}, `);
}

/** The layer table and design settings; saving stores a new revision (runs keep theirs). */
export function DesignEditor({ designId, document, materials, save }: Props) {
  const [s, dispatch] = useReducer(editorReducer, document, fromDocument);
  const [state, action, pending] = useActionState(save, null);
  // Submitted by hand: a <form action> would be reset by React after the action, putting every
  // <select> back on its first option while the state still holds the chosen values.
  const submit = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(() => action(data));
  };
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  const err = (key: string) => errors[key];
  const inv = (key: string) => (errors[key]?.length ? 'border-alarm' : 'border-paper-line');
  const layerKey = (i: number, k: string) => `layers[${i}].${k}`;
  const setLayer = (index: number, patch: Partial<Omit<EditorLayer, 'id'>>) => dispatch({ type: 'layer', index, patch });
  const refChoices = (current: string) => (
    <>
      {current === FROM_FILE ? <option value={FROM_FILE}>{FROM_FILE}</option> : null}
      <MaterialOptions materials={{ ...materials, design: [] }} current={current === FROM_FILE ? '' : current} />
    </>
  );

  return (
    <form onSubmit={submit} className="flex flex-col gap-6" data-testid="design-editor">
      <input type="hidden" name="designId" value={designId} />
      <input type="hidden" name="document" value={JSON.stringify(toDocument(s))} />

      <fieldset className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <legend className="mb-2 text-sm font-semibold uppercase tracking-wider text-ink-faint">Design</legend>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-soft">Reference wavelength (nm)</span>
          <input
            className={`${cell} ${inv('referenceWavelengthNm')}`}
            inputMode="decimal"
            value={s.referenceWavelengthNm}
            aria-invalid={Boolean(err('referenceWavelengthNm'))}
            onChange={(e) => dispatch({ type: 'set', patch: { referenceWavelengthNm: e.target.value } })}
          />
          <FieldError errors={err('referenceWavelengthNm')} id="err-ref" />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-soft">Substrate</span>
          <select className={`${cell} ${inv('substrate')}`} value={s.substrate} onChange={(e) => dispatch({ type: 'set', patch: { substrate: e.target.value } })}>
            {refChoices(s.substrate)}
          </select>
          <FieldError errors={err('substrate')} id="err-substrate" />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-soft">Ambient</span>
          <select className={`${cell} ${inv('ambient')}`} value={s.ambient} onChange={(e) => dispatch({ type: 'set', patch: { ambient: e.target.value } })}>
            {refChoices(s.ambient)}
          </select>
          <FieldError errors={err('ambient')} id="err-ambient" />
        </label>
        <label className="flex items-center gap-2 self-end py-1 text-sm">
          <input type="checkbox" checked={s.backside} onChange={(e) => dispatch({ type: 'set', patch: { backside: e.target.checked } })} />
          Thick substrate, bare back face counted
        </label>
        <p className="text-sm text-ink-soft sm:col-span-2 lg:col-span-4">
          Design tolerances (a layer without its own takes these; empty: the shop default).
        </p>
        {(
          [
            ['tolThicknessPct', 'tolerance.thicknessPct', 'Thickness ± %'],
            ['tolIndexAbs', 'tolerance.indexAbs', 'Index ±'],
            ['tolCutErrorQwotPct', 'tolerance.cutErrorQwotPct', 'Cut error ± % QWOT'],
          ] as const
        ).map(([field, key, label]) => (
          <label key={field} className="flex flex-col gap-1 text-sm">
            <span className="font-medium text-ink-soft">{label}</span>
            <input className={`${cell} ${inv(key)}`} inputMode="decimal" value={s[field]} onChange={(e) => dispatch({ type: 'set', patch: { [field]: e.target.value } })} />
            <FieldError errors={err(key)} id={`err-${field}`} />
          </label>
        ))}
      </fieldset>

      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm" data-testid="editor-layers">
          <caption className="mb-2 text-left text-sm font-semibold uppercase tracking-wider text-ink-faint">Layers, in deposition order (1 touches the substrate)</caption>
          <thead className="text-xs uppercase tracking-wider text-ink-faint">
            <tr>
              <th className="pb-2 pr-2 font-medium">#</th>
              <th className="pb-2 pr-2 font-medium">Material</th>
              <th className="pb-2 pr-2 font-medium">Thickness</th>
              <th className="pb-2 pr-2 font-medium">
                Monitor <span className="normal-case">λ</span> nm
              </th>
              <th className="pb-2 pr-2 font-medium">T/R</th>
              <th className="pb-2 pr-2 font-medium">Chip</th>
              <th className="pb-2 pr-2 font-medium">Cut</th>
              <th className="pb-2 pr-2 font-medium">± % thick.</th>
              <th className="pb-2 pr-2 font-medium">± index</th>
              <th className="pb-2 pr-2 font-medium">± % QWOT cut</th>
              <th className="pb-2 font-medium">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-paper-line">
            {s.layers.map((l, i) => {
              const n = i + 1;
              const thicknessKey = layerKey(i, l.unit === 'qwot' ? 'qwot' : 'thicknessNm');
              return (
                <tr key={l.id} data-editor-layer={n} className="align-top">
                  <td className="py-1.5 pr-2 font-mono">{n}</td>
                  <td className="py-1.5 pr-2">
                    <select
                      aria-label={`Material of layer ${n}`}
                      className={`${cell} max-w-36 ${inv(layerKey(i, 'material'))}`}
                      value={l.material}
                      onChange={(e) => setLayer(i, { material: e.target.value })}
                    >
                      <MaterialOptions materials={materials} current={l.material} />
                    </select>
                    <FieldError errors={err(layerKey(i, 'material'))} id={`err-${n}-material`} />
                  </td>
                  <td className="py-1.5 pr-2 whitespace-nowrap">
                    <input
                      aria-label={`Thickness of layer ${n}`}
                      className={`${cell} w-20 ${inv(thicknessKey)}`}
                      inputMode="decimal"
                      value={l.thickness}
                      onChange={(e) => setLayer(i, { thickness: e.target.value })}
                    />{' '}
                    <select aria-label={`Thickness unit of layer ${n}`} className={`${cell} border-paper-line`} value={l.unit} onChange={(e) => setLayer(i, { unit: e.target.value as 'nm' | 'qwot' })}>
                      <option value="nm">nm</option>
                      <option value="qwot">QWOT</option>
                    </select>
                    <FieldError errors={err(thicknessKey)} id={`err-${n}-thickness`} />
                  </td>
                  <NumberCell label={`Monitor wavelength of layer ${n}`} value={l.wavelengthNm} onChange={(v) => setLayer(i, { wavelengthNm: v })} errors={err(layerKey(i, 'monitor.wavelengthNm'))} />
                  <td className="py-1.5 pr-2">
                    <select aria-label={`Monitor mode of layer ${n}`} className={`${cell} border-paper-line`} value={l.mode} onChange={(e) => setLayer(i, { mode: e.target.value as 'T' | 'R' })}>
                      <option value="T">T</option>
                      <option value="R">R</option>
                    </select>
                  </td>
                  <NumberCell label={`Witness chip of layer ${n}`} value={l.chip} onChange={(v) => setLayer(i, { chip: v })} errors={err(layerKey(i, 'monitor.chip'))} widthClass="w-14" />
                  <td className="py-1.5 pr-2">
                    <select aria-label={`Cut of layer ${n}`} className={`${cell} border-paper-line`} value={l.cut} onChange={(e) => setLayer(i, { cut: e.target.value as EditorLayer['cut'] })}>
                      <option value="turning-point">turning point</option>
                      <option value="level">level</option>
                    </select>
                  </td>
                  {(
                    [
                      ['tolThicknessPct', 'tolerance.thicknessPct', 'thickness tolerance %'],
                      ['tolIndexAbs', 'tolerance.indexAbs', 'index tolerance'],
                      ['tolCutErrorQwotPct', 'tolerance.cutErrorQwotPct', 'cut error tolerance % QWOT'],
                    ] as const
                  ).map(([field, key, label]) => (
                    <NumberCell key={field} label={`${label} of layer ${n}`} placeholder="design" widthClass="w-16" value={l[field]} onChange={(v) => setLayer(i, { [field]: v })} errors={err(layerKey(i, key))} />
                  ))}
                  <td className="py-1.5 whitespace-nowrap">
                    <div className="flex gap-1">
                      <button type="button" className="rounded border border-paper-line px-2 py-1 disabled:opacity-40" aria-label={`Move layer ${n} up`} disabled={i === 0} onClick={() => dispatch({ type: 'move', index: i, by: -1 })}>
                        ↑
                      </button>
                      <button
                        type="button"
                        className="rounded border border-paper-line px-2 py-1 disabled:opacity-40"
                        aria-label={`Move layer ${n} down`}
                        disabled={i === s.layers.length - 1}
                        onClick={() => dispatch({ type: 'move', index: i, by: 1 })}
                      >
                        ↓
                      </button>
                      <button type="button" className="rounded border border-paper-line px-2 py-1" aria-label={`Duplicate layer ${n}`} onClick={() => dispatch({ type: 'duplicate', index: i })}>
                        Copy
                      </button>
                      <button
                        type="button"
                        className="rounded border border-alarm/40 px-2 py-1 text-alarm"
                        aria-label={`Remove layer ${n}`}
                        title={`Remove layer ${n}`}
                        onClick={() => dispatch({ type: 'remove', index: i })}
                      >
                        ✕
                      </button>
                    </div>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <FieldError errors={err('layers')} id="err-layers" />
      </div>

      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="rounded-md border border-paper-line bg-paper-raised px-4 py-2 text-sm font-medium hover:bg-paper-sunk" onClick={() => dispatch({ type: 'add' })}>
          Add a layer
        </button>
        <button
          type="submit"
          disabled={pending}
          className="inline-flex items-center justify-center rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised transition hover:bg-fringe-dark disabled:cursor-wait disabled:opacity-60"
        >
          {pending ? 'Saving…' : 'Save as a new revision'}
        </button>
        <span className="text-sm text-ink-soft">Runs already made keep the revision they were made with.</span>
      </div>
      {state && !state.ok ? <FormMessage tone="error">{readable(state.message)}</FormMessage> : null}
    </form>
  );
}
