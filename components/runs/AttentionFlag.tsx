import type { RunSummaryJson } from '@/app/_lib/api/json';

/** Why a run needs a look, in words, or null when it does not. */
export function attentionReasons(r: Pick<RunSummaryJson, 'flagged' | 'analysisState' | 'warningCount' | 'cutsOutsideTolerance'>): string[] | null {
  if (!r.flagged) return null;
  const why: string[] = [];
  if (r.cutsOutsideTolerance > 0) why.push(`${r.cutsOutsideTolerance} cut${r.cutsOutsideTolerance === 1 ? '' : 's'} outside tolerance`);
  if (r.warningCount > 0) why.push(`${r.warningCount} warning${r.warningCount === 1 ? '' : 's'}`);
  if (r.analysisState === 'failed') why.push('an analysis failed');
  return why.length ? why : ['needs a look'];
}

/** The runs list's mark for a run that needs attention: a filled marker and the reasons in words. */
export function AttentionFlag({ run }: { run: Parameters<typeof attentionReasons>[0] }) {
  const why = attentionReasons(run);
  if (!why) return <span className="text-xs text-ink-faint">–</span>;
  return (
    <span className="inline-flex items-start gap-1.5 text-xs text-alarm" data-testid="attention">
      <span aria-hidden className="mt-1 inline-block h-2 w-2 shrink-0 rounded-full bg-alarm" />
      <span>{why.join(' · ')}</span>
    </span>
  );
}
