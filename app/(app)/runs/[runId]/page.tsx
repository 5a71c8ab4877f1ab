import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { AnalysisStateBadge } from '@/components/runs/AnalysisStateBadge';
import { IndexDriftList } from '@/components/runs/IndexDriftList';
import { LayerTable } from '@/components/runs/LayerTable';
import { formatBytes, formatDate } from '@/components/runs/format';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { AnalysisHistory } from '@/components/runs/AnalysisHistory';
import { ReanalyseForm } from '@/components/runs/ReanalyseForm';
import { findAnalysis, latestAnalyses, listAnalysesOfRun, type AnalysisMode } from '@/db/queries/analyses';
import { findRun } from '@/db/queries/runs';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { driftRows, layerRows, parseRunId } from './runView';

export const metadata: Metadata = { title: 'Run' };

const modes: { mode: AnalysisMode; label: string; about: string }[] = [
  { mode: 'refit', label: 'Joint re-fit', about: 'after each layer, every layer of the chip re-estimated from all its data' },
  { mode: 'sequential', label: 'Layer by layer', about: 'each layer fitted once, on the stack below as first estimated, as the chamber saw it' },
];

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div>
      <dt className="text-xs uppercase tracking-wider text-ink-faint">{label}</dt>
      <dd className="mt-0.5">{children}</dd>
    </div>
  );
}

export default async function RunPage({ params, searchParams }: { params: Promise<{ runId: string }>; searchParams: Promise<{ mode?: string | string[]; analysis?: string | string[] }> }) {
  const user = await requireCapability('viewRuns');
  const { runId } = await params;
  const id = parseRunId(runId);
  const found = id === null ? undefined : await findRun(id);
  if (!found) notFound();
  const { run, design, chamber, trace } = found;
  const byMode = await latestAnalyses(run.id);
  const query = await searchParams;
  // An earlier analysis, asked for by ?analysis=ID, takes the place of the newest of its mode.
  const pinnedId = parseRunId(String(query.analysis ?? ''));
  const pinned = pinnedId === null ? undefined : await findAnalysis(pinnedId);
  if (pinned && pinned.analysis.runId === run.id) byMode[pinned.analysis.mode] = pinned;
  const asked = pinned?.analysis.runId === run.id ? pinned.analysis.mode : query.mode;
  const available = modes.filter((m) => byMode[m.mode]);
  const shown = available.find((m) => m.mode === asked) ?? available[0];
  const current = shown ? byMode[shown.mode] : undefined;
  const history = await listAnalysesOfRun(run.id);
  const newestIds = modes.map((m) => history.find((a) => a.mode === m.mode)?.id).filter((x): x is number => x !== undefined);

  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/runs" className="text-fringe underline-offset-2 hover:underline">
          ← All runs
        </Link>
      </p>
      <PageHeader title={`Run ${run.runCode}`} lead={`${design.name} (revision ${design.revision}, ${design.layerCount} layer${design.layerCount === 1 ? '' : 's'}) in ${chamber.name}`} />
      <p className="mb-6 rounded-md border border-brass/40 bg-brass-light px-4 py-2 text-sm" data-testid="advisory">
        Fringelog&apos;s figures are advisory; cut and disposition decisions follow your shop&apos;s procedures.
      </p>
      <Panel className="mb-6">
        <dl className="grid grid-cols-2 gap-4 text-sm md:grid-cols-4">
          <Fact label="Chamber">{chamber.name}</Fact>
          <Fact label="Operator">{found.operatorUserName ?? run.operatorName ?? '–'}</Fact>
          <Fact label="Shift">{run.shift ?? '–'}</Fact>
          <Fact label="Date">{formatDate(run.startedAt)}</Fact>
          <Fact label="Design">
            {design.name} <span className="text-ink-faint">rev. {design.revision}</span>
          </Fact>
          <Fact label="Reference wavelength">{design.referenceWavelengthNm} nm</Fact>
          <Fact label="Trace file">
            <span className="font-mono text-xs">{trace?.fileName ?? '–'}</span>
            {trace ? (
              <span className="block text-xs text-ink-faint">
                {formatBytes(trace.byteSize)} · {trace.rowCount.toLocaleString('en-GB')} samples · {trace.columns.join(', ')}
              </span>
            ) : null}
          </Fact>
          <Fact label="SHA-256">
            <span className="font-mono text-xs break-all text-ink-soft" title={trace?.sha256}>
              {trace ? `${trace.sha256.slice(0, 16)}…` : '–'}
            </span>
          </Fact>
        </dl>
      </Panel>

      {available.length === 0 ? (
        <Panel>
          <p className="text-ink-soft">This run has not been analysed yet.</p>
        </Panel>
      ) : (
        <>
          <nav aria-label="Analysis" className="mb-4 flex flex-wrap items-center gap-2">
            {available.map((m) => (
              <Link
                key={m.mode}
                href={`/runs/${run.id}?mode=${m.mode}`}
                aria-current={m.mode === shown?.mode ? 'page' : undefined}
                className={`rounded-md border px-3 py-1.5 text-sm font-medium ${
                  m.mode === shown?.mode ? 'border-fringe bg-fringe-light text-fringe-dark' : 'border-paper-line bg-paper-raised text-ink-soft hover:bg-paper-sunk'
                }`}
              >
                {m.label}
              </Link>
            ))}
            {shown ? <span className="text-sm text-ink-faint">{shown.about}</span> : null}
          </nav>
          {current ? (
            <>
              <Panel title="Layers" className="mb-6">
                <div className="mb-3 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
                  <AnalysisStateBadge state={current.analysis.state} />
                  {current.analysis.finishedAt ? <span>finished {formatTime(current.analysis.finishedAt)}</span> : null}
                </div>
                {current.analysis.state === 'failed' ? (
                  <p className="rounded-md bg-alarm-light px-3 py-2 font-mono text-sm text-alarm" data-testid="analysis-error">
                    {current.analysis.error}
                  </p>
                ) : current.analysis.state === 'done' ? (
                  <LayerTable layers={layerRows(current)} />
                ) : (
                  <p className="text-ink-soft">The analysis is not finished yet.</p>
                )}
              </Panel>
              {current.analysis.state === 'done' ? (
                <div className="grid gap-6 md:grid-cols-2">
                  <Panel title="Run warnings">
                    {current.analysis.warnings.length ? (
                      <ul className="flex list-disc flex-col gap-1 pl-5 text-sm" data-testid="run-warnings">
                        {current.analysis.warnings.map((w, i) => (
                          <li key={i}>{w}</li>
                        ))}
                      </ul>
                    ) : (
                      <p className="text-sm text-ink-soft">None.</p>
                    )}
                  </Panel>
                  <Panel title="Index against nominal, per material">
                    <IndexDriftList drift={driftRows(current)} />
                  </Panel>
                </div>
              ) : null}
            </>
          ) : null}
        </>
      )}
      <Panel title="Analyses of this run" className="mt-6">
        <p className="mb-2 text-xs text-ink-faint">Every result is kept; the newest of each mode is the one shown unless an earlier one is picked.</p>
        <AnalysisHistory runId={run.id} entries={history} shownId={current?.analysis.id} newestIds={newestIds} />
      </Panel>
      {can(user.role, 'reanalyseRuns') ? (
        <Panel title="Analyse again with other settings" className="mt-6">
          <ReanalyseForm runId={run.id} />
        </Panel>
      ) : null}
    </>
  );
}
