'use client';

import Link from 'next/link';
import { useQueries } from '@tanstack/react-query';
import { warningsInWords } from '@/analysis/fit/analysisNotes';
import { AnalysisStateBadge } from '@/components/runs/AnalysisStateBadge';
import { analysisFinished as finished, analysisQuery } from '@/components/query/analysisQuery';

const modeLabel = { sequential: 'Layer by layer', refit: 'Joint re-fit' } as const;

/** The queued analyses of an upload, polled every 1.5 s until each is done or failed, then the way to the run. */
export function AnalysisWatch({ run, analyses }: { run: { url: string; runCode: string }; analyses: { id: string; mode: 'sequential' | 'refit' }[] }) {
  const results = useQueries({
    queries: analyses.map((a) => analysisQuery(a.id)),
  });
  const allDone = results.every((r) => finished(r.data));
  return (
    <div className="flex flex-col gap-2" data-testid="analysis-watch">
      <ul className="flex flex-col gap-1 text-sm">
        {analyses.map((a, i) => {
          const d = results[i].data;
          return (
            <li key={a.id} className="flex flex-wrap items-center gap-2" data-mode={a.mode} data-state={d?.state ?? 'queued'}>
              <span className="w-32 text-ink-soft">{modeLabel[a.mode]}</span>
              <AnalysisStateBadge state={d?.state ?? 'queued'} />
              {d?.state === 'done' && d.result ? (
                <span className="text-xs text-ink-faint">
                  {d.result.layers.length} layer{d.result.layers.length === 1 ? '' : 's'} fitted, {warningsInWords(d.result.warnings)}
                </span>
              ) : null}
              {d?.state === 'failed' ? <span className="font-mono text-xs text-alarm">{d.error}</span> : null}
            </li>
          );
        })}
      </ul>
      {allDone ? (
        <Link href={run.url} className="self-start rounded-md bg-fringe px-3 py-1.5 text-sm font-medium text-paper-raised hover:bg-fringe-dark" data-testid="open-run">
          Open run {run.runCode} →
        </Link>
      ) : (
        <p className="text-xs text-ink-faint">Stored. The analysis runs on the shop&apos;s workers; this updates by itself, and you may leave the page.</p>
      )}
    </div>
  );
}
