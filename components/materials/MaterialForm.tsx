'use client';

import { startTransition, useActionState, useMemo, useState } from 'react';
import { materialModelSchema } from '@/analysis/materials';
import { FormMessage, formError, type FormAction } from '@/components/forms';
import { MaterialCurve } from './MaterialCurve';
import { formFromModel, modelFromForm, type MaterialFormState, type ModelKind } from './materialFormState';

type Props = {
  action: FormAction;
  /** Absent: a new material, with a name field. */
  existing?: { name: string; model: unknown; description: string; source: string };
};

const input = 'rounded-md border bg-paper-raised px-3 py-2 text-sm';

/** A shop material: name, where its numbers come from, and a model of shared/FORMATS.md, with its n and k drawn as typed. */
export function MaterialForm({ action, existing }: Props) {
  const [state, formAction, pending] = useActionState(action, null);
  // Submitted by hand: React resets a <form action> afterwards, which would put the model <select> back on its first option.
  const submit = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(() => formAction(data));
  };
  const [name, setName] = useState(existing?.name ?? '');
  const [description, setDescription] = useState(existing?.description ?? '');
  const [source, setSource] = useState(existing?.source ?? '');
  const [m, setM] = useState<MaterialFormState>(() => formFromModel(existing?.model));
  const set = (patch: Partial<MaterialFormState>) => setM((old) => ({ ...old, ...patch }));
  const model = useMemo(() => modelFromForm(m), [m]);
  const preview = useMemo(() => materialModelSchema.safeParse(model), [model]);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  const errorOf = (...keys: string[]) => {
    const found = Object.entries(errors).filter(([k]) => keys.some((key) => k === key || k.startsWith(`${key}[`) || k.startsWith(`${key}.`)));
    return found.length ? found.map(([k, v]) => `${k}: ${(v ?? []).join(' ')}`).join(' ') : null;
  };
  const field = (label: string, value: string, onChange: (v: string) => void, keys: string[], hint?: string, wide = false) => {
    const error = errorOf(...keys);
    return (
      <label className={`flex flex-col gap-1 text-sm ${wide ? 'sm:col-span-2' : ''}`}>
        <span className="font-medium text-ink-soft">{label}</span>
        <input className={`${input} ${error ? 'border-alarm' : 'border-paper-line'}`} value={value} onChange={(e) => onChange(e.target.value)} aria-invalid={Boolean(error)} />
        {error ? (
          <span role="alert" className="text-xs text-alarm" data-field-error={keys[0]}>
            {error}
          </span>
        ) : hint ? (
          <span className="text-xs text-ink-faint">{hint}</span>
        ) : null}
      </label>
    );
  };
  const message = formError(state);

  return (
    <form onSubmit={submit} className="flex flex-col gap-5" data-testid="material-form">
      <input type="hidden" name="name" value={existing?.name ?? name} />
      <input type="hidden" name="input" value={JSON.stringify({ name: existing?.name ?? name, description, source, model })} />
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        {existing ? null : field('Name', name, setName, ['name'], 'As designs will name it, e.g. LK-SiO2-IAD.')}
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-soft">Dispersion model</span>
          <select className={`${input} border-paper-line`} value={m.model} onChange={(e) => set({ model: e.target.value as ModelKind })}>
            <option value="constant">constant n, k</option>
            <option value="cauchy">Cauchy n = A + B/λ² + C/λ⁴ (λ in µm)</option>
            <option value="sellmeier">Sellmeier n² = 1 + Σ Bᵢλ²/(λ² − Cᵢ²) (λ, Cᵢ in µm)</option>
            <option value="table">table of λ, n, k</option>
          </select>
        </label>
        {m.model === 'constant' ? (
          <>
            {field('n', m.n, (v) => set({ n: v }), ['model.n'])}
            {field('k', m.k, (v) => set({ k: v }), ['model.k'], 'Extinction coefficient, 0 for a clear film.')}
          </>
        ) : null}
        {m.model === 'cauchy' ? (
          <>
            {field('A', m.A, (v) => set({ A: v }), ['model.A'])}
            {field('B (µm²)', m.B, (v) => set({ B: v }), ['model.B'])}
            {field('C (µm⁴)', m.C, (v) => set({ C: v }), ['model.C'])}
            {field('k', m.k, (v) => set({ k: v }), ['model.k'])}
          </>
        ) : null}
        {m.model === 'sellmeier' ? (
          <>
            {field('B₁, B₂, …', m.sellB, (v) => set({ sellB: v }), ['model.B'], 'Comma-separated.')}
            {field('C₁, C₂, … (µm, resonance wavelengths)', m.sellC, (v) => set({ sellC: v }), ['model.C'], 'Same count as B.')}
          </>
        ) : null}
        {m.model === 'table' ? (
          <label className="flex flex-col gap-1 text-sm sm:col-span-2">
            <span className="font-medium text-ink-soft">One row a line: wavelength nm, n, k</span>
            <textarea
              rows={6}
              className={`${input} font-mono ${errorOf('model.points') ? 'border-alarm' : 'border-paper-line'}`}
              value={m.table}
              onChange={(e) => set({ table: e.target.value })}
            />
            {errorOf('model.points') ? (
              <span role="alert" className="text-xs text-alarm" data-field-error="model.points">
                {errorOf('model.points')}
              </span>
            ) : null}
          </label>
        ) : null}
        {field('Valid from (nm)', m.validFromNm, (v) => set({ validFromNm: v }), ['model.validFromNm'], 'Optional; outside its range a model is refused.')}
        {field('Valid to (nm)', m.validToNm, (v) => set({ validToNm: v }), ['model.validToNm'])}
        {field('Description', description, setDescription, ['description'], undefined, true)}
        {field('Source of the numbers', source, setSource, ['source'], 'A fit of our runs, a supplier sheet, a paper; say "from memory" if so.', true)}
      </div>
      {errorOf('model') && !Object.keys(errors).some((k) => k.startsWith('model.')) ? <FormMessage tone="error">{errorOf('model')}</FormMessage> : null}
      <div>
        <h3 className="mb-2 text-sm font-semibold text-ink-soft">n and k as entered</h3>
        {preview.success ? <MaterialCurve model={preview.data} name={existing?.name ?? (name || 'the new material')} /> : <p className="text-sm text-ink-faint">The curve appears once the model is complete.</p>}
      </div>
      <div>
        <button
          type="submit"
          disabled={pending}
          className="inline-flex items-center justify-center rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised transition hover:bg-fringe-dark disabled:cursor-wait disabled:opacity-60"
        >
          {pending ? 'Working…' : existing ? 'Save changes' : 'Create material'}
        </button>
      </div>
    </form>
  );
}
