import type { Metadata } from 'next';
import Link from 'next/link';
import { AnalysisStateBadge } from '@/components/runs/AnalysisStateBadge';
import { fixed, formatDate } from '@/components/runs/format';
import { PageHeader, Panel } from '@/components/ui/Page';
import { listRuns } from '@/db/queries/runs';
import { requireCapability } from '@/app/_lib/auth';

export const metadata: Metadata = { title: 'Runs' };

export default async function RunsPage() {
  await requireCapability('viewRuns');
  const runs = await listRuns();
  return (
    <>
      <PageHeader title="Runs" lead="Every coating run with a stored monitor trace, newest first, and how far its worst layer was cut from the design." />
      <Panel>
        {runs.length === 0 ? (
          <p className="text-ink-soft" data-testid="runs-empty">
            No runs yet. A run appears here once its monitor trace is stored.
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="runs-table">
              <thead className="text-xs uppercase tracking-wider text-ink-faint">
                <tr>
                  <th className="pb-2 pr-4 font-medium">Run</th>
                  <th className="pb-2 pr-4 font-medium">Design</th>
                  <th className="pb-2 pr-4 font-medium">Chamber</th>
                  <th className="pb-2 pr-4 font-medium">Operator</th>
                  <th className="pb-2 pr-4 font-medium">Shift</th>
                  <th className="pb-2 pr-4 font-medium">Date</th>
                  <th className="pb-2 pr-4 font-medium">Analysis</th>
                  <th className="pb-2 text-right font-medium whitespace-nowrap">
                    Worst |cut error|
                    <span className="block normal-case tracking-normal">% QWOT</span>
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
                {runs.map((r) => (
                  <tr key={r.id} data-run-code={r.runCode}>
                    <td className="py-2 pr-4 font-mono whitespace-nowrap">
                      <Link className="text-fringe underline-offset-2 hover:underline" href={`/runs/${r.id}`}>
                        {r.runCode}
                      </Link>
                    </td>
                    <td className="py-2 pr-4">
                      {r.designName} <span className="text-xs text-ink-faint">rev. {r.designRevision}</span>
                    </td>
                    <td className="py-2 pr-4 whitespace-nowrap">{r.chamberName}</td>
                    <td className="py-2 pr-4">{r.operatorName ?? '–'}</td>
                    <td className="py-2 pr-4">{r.shift ?? '–'}</td>
                    <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap text-ink-soft">{formatDate(r.startedAt)}</td>
                    <td className="py-2 pr-4 whitespace-nowrap">
                      <AnalysisStateBadge state={r.analysisState} />
                    </td>
                    <td className="py-2 text-right font-mono whitespace-nowrap" title={r.worstCutMode ? `from the ${r.worstCutMode} analysis` : undefined}>
                      {fixed(r.worstCutErrorQwotPct, 2)}
                      {r.worstCutMode ? <span className="ml-1 text-xs text-ink-faint">{r.worstCutMode}</span> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </>
  );
}
