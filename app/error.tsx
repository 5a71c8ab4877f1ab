'use client';

import { useEffect } from 'react';

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <div className="mx-auto flex min-h-[50vh] max-w-lg flex-col justify-center gap-4 p-6">
      <h1 className="text-2xl font-semibold">Something went wrong</h1>
      <p className="text-ink-soft">
        The page could not be shown. It has been logged{error.digest ? ` as ${error.digest}` : ''}; try again, and tell an administrator if it keeps
        happening.
      </p>
      <div>
        <button type="button" onClick={reset} className="rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised hover:bg-fringe-dark">
          Try again
        </button>
      </div>
    </div>
  );
}
