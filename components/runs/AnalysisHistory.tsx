import Link from 'next/link';
import { warningsInWords } from '@/analysis/fit/analysisNotes';
import { formatTime } from '@/components/ui/Page';
import { AnalysisStateBadge } from './AnalysisStateBadge';
import { describeSettings } from './describeSettings';

export type HistoryEntry = {
  id: number;
  mode: 'sequential' | 'refit';
  state: 'queued' | 'running' | 'done' | 'failed';
  settings: Record<string, unknown>;
  createdAt: Date;
  finishedAt: Date | null;
  warnings: string[];
};

/** Every analysis of a run, newest first; the one on screen is marked, the others open by link. */
export function AnalysisHistory({ runId, entries, shownId, newestIds }: { runId: number; entries: HistoryEntry[]; shownId?: number; newestIds: number[] }) {
  return (
    <ol className="flex flex-col divide-y divide-paper-line text-sm" data-testid="analysis-history">
      {entries.map((a) => (
        <li key={a.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2" data-analysis-id={a.id}>
          <span className="font-mono text-xs text-ink-faint">#{a.id}</span>
          <AnalysisStateBadge state={a.state} />
          <span className="min-w-0 flex-1">{describeSettings({ ...a.settings, mode: a.mode === 'refit' ? 'joint re-fit' : 'layer by layer' })}</span>
          <span className="text-xs text-ink-faint">
            queued {formatTime(a.createdAt)}
            {a.finishedAt ? ` · finished ${formatTime(a.finishedAt)}` : ''}
            {a.state === 'done' ? ` · ${warningsInWords(a.warnings)}` : ''}
          </span>
          {a.id === shownId ? (
            <span className="text-xs font-medium text-fringe-dark">shown above</span>
          ) : a.state === 'done' || a.state === 'failed' ? (
            <Link href={newestIds.includes(a.id) ? `/runs/${runId}?mode=${a.mode}` : `/runs/${runId}?analysis=${a.id}`} className="text-xs text-fringe underline-offset-2 hover:underline">
              show
            </Link>
          ) : null}
        </li>
      ))}
    </ol>
  );
}
