'use client';

import { useState } from 'react';

type Props = {
  name: string;
  label: string;
  type?: 'text' | 'email' | 'password';
  autoComplete?: string;
  defaultValue?: string;
  errors?: string[];
  hint?: string;
  required?: boolean;
};

/** A labelled input that keeps its value across a failed submit and shows its errors. */
export function Field({ name, label, type = 'text', autoComplete, defaultValue = '', errors, hint, required }: Props) {
  const [value, setValue] = useState(defaultValue);
  const id = `field-${name}`;
  const invalid = Boolean(errors?.length);
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink-soft">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type={type}
        value={value}
        onChange={(e) => setValue(e.target.value)}
        autoComplete={autoComplete}
        required={required}
        aria-invalid={invalid}
        aria-describedby={invalid ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className={`rounded-md border bg-paper-raised px-3 py-2 text-ink shadow-inner outline-none transition focus:border-fringe focus:ring-2 focus:ring-fringe/30 ${
          invalid ? 'border-alarm' : 'border-paper-line'
        }`}
      />
      {hint && !invalid ? (
        <p id={`${id}-hint`} className="text-xs text-ink-faint">
          {hint}
        </p>
      ) : null}
      {invalid ? (
        <p id={`${id}-error`} role="alert" className="text-sm text-alarm" data-field-error={name}>
          {errors?.join(' ')}
        </p>
      ) : null}
    </div>
  );
}
