'use client';

export type MaterialChoices = { design: string[]; shop: string[]; builtIn: string[] };

export const cell = 'rounded border bg-paper-raised px-2 py-1 text-sm';

export function FieldError({ errors, id }: { errors?: string[]; id: string }) {
  if (!errors?.length) return null;
  return (
    <span id={id} role="alert" className="mt-0.5 block text-xs text-alarm" data-field-error>
      {errors.join(' ')}
    </span>
  );
}

export function MaterialOptions({ materials, current }: { materials: MaterialChoices; current: string }) {
  const known = new Set([...materials.design, ...materials.shop, ...materials.builtIn]);
  return (
    <>
      {current && !known.has(current) ? <option value={current}>{current} (unknown)</option> : null}
      {materials.design.length ? (
        <optgroup label="In this design">
          {materials.design.map((m) => (
            <option key={`d-${m}`} value={m}>
              {m}
            </option>
          ))}
        </optgroup>
      ) : null}
      {materials.shop.length ? (
        <optgroup label="Shop materials">
          {materials.shop.filter((m) => !materials.design.includes(m)).map((m) => (
            <option key={`s-${m}`} value={m}>
              {m}
            </option>
          ))}
        </optgroup>
      ) : null}
      <optgroup label="Built-in library">
        {materials.builtIn.map((m) => (
          <option key={`b-${m}`} value={m}>
            {m}
          </option>
        ))}
      </optgroup>
    </>
  );
}

/** A numeric cell of the layer table, with its error under it. */
export function NumberCell({ label, value, onChange, errors, widthClass = 'w-20', placeholder }: { label: string; value: string; onChange: (v: string) => void; errors?: string[]; widthClass?: string; placeholder?: string }) {
  const invalid = Boolean(errors?.length);
  return (
    <td className="py-1.5 pr-2">
      <input
        aria-label={label}
        aria-invalid={invalid}
        placeholder={placeholder}
        className={`${cell} ${widthClass} ${invalid ? 'border-alarm' : 'border-paper-line'}`}
        inputMode="decimal"
        value={value}
        onChange={(e) => onChange(e.target.value)}
      />
      <FieldError errors={errors} id={`err-${label.replace(/\W+/g, '-')}`} />
    </td>
  );
}
