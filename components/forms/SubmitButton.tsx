'use client';

import { useFormStatus } from 'react-dom';

export function SubmitButton({ children, variant = 'primary' }: { children: React.ReactNode; variant?: 'primary' | 'quiet' | 'danger' }) {
  const { pending } = useFormStatus();
  const styles = {
    primary: 'bg-fringe text-paper-raised hover:bg-fringe-dark',
    quiet: 'border border-paper-line bg-paper-raised text-ink hover:bg-paper-sunk',
    danger: 'border border-alarm/40 bg-paper-raised text-alarm hover:bg-alarm-light',
  }[variant];
  return (
    <button
      type="submit"
      disabled={pending}
      className={`inline-flex items-center justify-center rounded-md px-4 py-2 text-sm font-medium transition disabled:cursor-wait disabled:opacity-60 ${styles}`}
    >
      {pending ? 'Working…' : children}
    </button>
  );
}
