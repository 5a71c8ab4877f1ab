'use client';

import { useEffect } from 'react';

/** Errors inside the signed-in area keep the shell (navigation, sign-out) around them. */
export default function AppError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <div role="alert" className="rounded-lg border border-alarm/30 bg-alarm-light p-6">
      <h1 className="text-xl font-semibold text-alarm">This page could not be shown</h1>
      <p className="mt-2 text-ink-soft">
        It has been logged{error.digest ? ` as ${error.digest}` : ''}. Try again; if it keeps happening, tell an administrator.
      </p>
      <button type="button" onClick={reset} className="mt-4 rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised hover:bg-fringe-dark">
        Try again
      </button>
    </div>
  );
}
