import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { isAnalysisNote } from '@/analysis/fit/analysisNotes';
import { AnalysisStateBadge } from '@/components/runs/AnalysisStateBadge';
import { ChipTable, ToolingList, type ChipView, type ToolingView } from '@/components/runs/ChipsAndTooling';
import { DispositionPanel } from '@/components/runs/DispositionPanel';
import { IndexDriftList } from '@/components/runs/IndexDriftList';
import { CommentForm, NoteList } from '@/components/runs/NoteList';
import { IndexPlot, SpectrumPlot, type SpectrumView } from '@/components/runs/RunCharts';
import { RunReview } from '@/components/runs/RunReview';
import { formatBytes, formatDate } from '@/components/runs/format';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { findAnalysis, latestAnalyses, listAnalysesOfRun, type AnalysisMode } from '@/db/queries/analyses';
import { dispositionAuthor, listAnnotations, listComments, runDesignDocument } from '@/db/queries/review';
import { AnalysisHistory } from '@/components/runs/AnalysisHistory';
import { QueryProvider } from '@/components/query/QueryProvider';
import { ReanalyseForm } from '@/components/runs/ReanalyseForm';
import { findRun } from '@/db/queries/runs';
import { findOverview } from '@/db/queries/series';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { addAnnotation, addComment, changeOwnNote, decideRun } from './actions';
import { chipRows, designOf, driftRows, driftWarnings, layerRows, materialNames, parseRunId, traceSpans } from './runView';

export const metadata: Metadata = { title: 'Run' };

const modes: { mode: AnalysisMode; label: string; about: string }[] = [
  { mode: 'refit', label: 'Joint re-fit', about: 'after each layer, every layer of the chip re-estimated from all its data' },
  { mode: 'sequential', label: 'Layer by layer', about: 'each layer fitted once, on the stack below as first estimated, as the chamber saw it' },
];

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="min-w-0">
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
  const [byMode, annotations, comments, decidedBy, stored] = await Promise.all([
    latestAnalyses(run.id), listAnnotations(run.id), listComments(run.id), dispositionAuthor(run.dispositionBy), runDesignDocument(run.id),
  ]);
  const query = await searchParams;
  // An earlier analysis, asked for by ?analysis=ID, takes the place of the newest of its mode.
  const pinnedId = parseRunId(String(query.analysis ?? ''));
  const pinned = pinnedId === null ? undefined : await findAnalysis(pinnedId);
  if (pinned && pinned.analysis.runId === run.id) byMode[pinned.analysis.mode] = pinned;
  const asked = pinned?.analysis.runId === run.id ? pinned.analysis.mode : query.mode;
  const available = modes.filter((m) => byMode[m.mode]);
  const shown = available.find((m) => m.mode === asked) ?? available[0];
  const current = shown ? byMode[shown.mode] : undefined;
  const other = shown ? byMode[shown.mode === 'refit' ? 'sequential' : 'refit'] : undefined;
  const parsed = designOf(stored?.document);
  const names = materialNames(stored?.document);
  const labelOf = (m: string) => (names[m] ? `${m} · ${names[m]}` : m);
  const done = current?.analysis.state === 'done' ? current : undefined;
  const layers = done ? layerRows(done, parsed, other?.analysis.state === 'done' ? other : null, names) : [];
  const drift = done ? driftRows(done) : [];
  const overview = done ? await findOverview(done.analysis.id) : undefined;
  const summary = done?.analysis.summary ?? {};
  const tooling = (Array.isArray(summary.tooling) ? summary.tooling : []) as Omit<ToolingView, 'label'>[];
  const spectrum = summary.spectrum as SpectrumView | undefined;
  const messages = done ? [...driftWarnings(drift, names), ...done.analysis.warnings] : [];
  // what the analysis did (a start-up delay, a ripple divided out) apart from what needs a look (analysis/fit/analysisNotes.ts)
  const warnings = messages.filter((m) => !isAnalysisNote(m));
  const notes = messages.filter(isAnalysisNote);
  const monitorWavelengths = [...new Set(layers.map((l) => l.wavelengthNm).filter((w) => w !== null))];
  const writes = can(user.role, 'writeRunNotes');
  const history = await listAnalysesOfRun(run.id);
  const newestIds = modes.map((m) => history.find((a) => a.mode === m.mode)?.id).filter((x): x is number => x !== undefined);

  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/runs" className="text-fringe underline-offset-2 hover:underline">← All runs</Link>
        <Link href={`/runs/${run.id}/report`} className="ml-4 text-fringe underline-offset-2 hover:underline" data-testid="report-link">Printable report</Link>
      </p>
      <PageHeader title={`Run ${run.runCode}`} lead={`${design.name} (revision ${design.revision}, ${design.layerCount} layer${design.layerCount === 1 ? '' : 's'}) in ${chamber.name}`} />
      <DispositionPanel
        runId={run.id}
        current={run.disposition ? { value: run.disposition, reason: run.dispositionReason, byName: decidedBy, at: run.dispositionAt } : null}
        decide={can(user.role, 'setRunDisposition') ? decideRun : null}
      />
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
            <Link className="text-fringe underline-offset-2 hover:underline" href={`/designs/${design.designId}?revision=${design.revision}`} data-testid="run-design-link">
              {design.name} <span className="text-ink-faint">rev. {design.revision}</span>
            </Link>
          </Fact>
          <Fact label="Materials">{Object.keys(names).length ? Object.keys(names).map(labelOf).join(', ') : '–'}</Fact>
          <Fact label="Trace file">
            <span className="font-mono text-xs break-all">{trace?.fileName ?? '–'}</span>
            {trace ? (
              <span className="block text-xs text-ink-faint">
                {formatBytes(trace.byteSize)} · {trace.rowCount.toLocaleString('en-GB')} samples · {trace.columns.join(', ')}
              </span>
            ) : null}
          </Fact>
          <Fact label="Downloads">
            <a className="block text-fringe underline-offset-2 hover:underline" href={`/api/runs/${run.id}/trace`} download>Raw trace (CSV)</a>
            <a className="block text-fringe underline-offset-2 hover:underline" href={`/api/runs/${run.id}/results.csv`} download>Results (CSV)</a>
            <span className="block font-mono text-xs break-all text-ink-faint" title={trace?.sha256}>SHA-256 {trace ? `${trace.sha256.slice(0, 12)}…` : '–'}</span>
          </Fact>
        </dl>
      </Panel>

      {available.length === 0 ? (
        <Panel className="mb-6"><p className="text-ink-soft">This run has not been analysed yet.</p></Panel>
      ) : (
        <nav aria-label="Analysis" className="mb-4 flex flex-wrap items-center gap-2">
          {available.map((m) => (
            <Link
              key={m.mode}
              href={`/runs/${run.id}?mode=${m.mode}`}
              aria-current={m.mode === shown?.mode ? 'page' : undefined}
              className={`rounded-md border px-3 py-1.5 text-sm font-medium ${m.mode === shown?.mode ? 'border-fringe bg-fringe-light text-fringe-dark' : 'border-paper-line bg-paper-raised text-ink-soft hover:bg-paper-sunk'}`}
            >
              {m.label}
            </Link>
          ))}
          {shown ? <span className="text-sm text-ink-faint">{shown.about}</span> : null}
        </nav>
      )}
      {current && current.analysis.state !== 'done' ? (
        <Panel className="mb-6">
          <div className="mb-3 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
            <AnalysisStateBadge state={current.analysis.state} />
          </div>
          {current.analysis.state === 'failed' ? (
            <p className="rounded-md bg-alarm-light px-3 py-2 font-mono text-sm break-words text-alarm" data-testid="analysis-error">{current.analysis.error}</p>
          ) : (
            <p className="text-ink-soft">The analysis is not finished yet.</p>
          )}
        </Panel>
      ) : null}
      {done ? (
        <>
          <Panel title="Trace and layers" className="mb-6">
            <div className="mb-3 flex flex-wrap items-center gap-3 text-sm text-ink-soft">
              <AnalysisStateBadge state={done.analysis.state} />
              {done.analysis.finishedAt ? <span>finished {formatTime(done.analysis.finishedAt)}</span> : null}
              <span>cut errors graded against the design&apos;s tolerances, else the shop default</span>
            </div>
            <RunReview
              key={done.analysis.id}
              runId={run.id}
              analysisId={done.analysis.id}
              overview={overview ? { ...overview, decimated: true } : null}
              layers={layers}
              spans={traceSpans(layers)}
              annotations={annotations}
              me={user.id}
              addAnnotation={writes ? addAnnotation : null}
              changeNote={writes ? changeOwnNote : null}
            />
          </Panel>
          <div className="mb-6 grid gap-6 md:grid-cols-2">
            <Panel title="Run warnings" className="min-w-0">
              {warnings.length ? (
                <ul className="flex list-disc flex-col gap-1 pl-5 text-sm break-words" data-testid="run-warnings">
                  {warnings.map((w, i) => <li key={i}>{w}</li>)}
                </ul>
              ) : (
                <p className="text-sm text-ink-soft">None.</p>
              )}
              {notes.length > 0 && (
                <>
                  <h3 className="mt-3 text-xs font-semibold uppercase tracking-wide text-ink-soft">What the analysis did</h3>
                  <ul className="mt-1 flex list-disc flex-col gap-1 pl-5 text-xs text-ink-soft break-words" data-testid="run-notes">
                    {notes.map((w, i) => <li key={i}>{w}</li>)}
                  </ul>
                </>
              )}
            </Panel>
            <Panel title="Index against nominal, per material" className="min-w-0">
              <IndexPlot
                wavelengthNm={monitorWavelengths.length === 1 ? monitorWavelengths[0] : null}
                series={drift.map((d) => ({ ...d, label: labelOf(d.material) }))}
              />
              <p className="mt-1 text-xs text-ink-soft">Each layer&apos;s own reading, ±1σ, and its material&apos;s trend (the table below); the layer table gives each index as read with that trend where the analysis pooled them.</p>
              <div className="mt-3 overflow-x-auto"><IndexDriftList drift={drift.map((d) => ({ ...d, material: labelOf(d.material) }))} /></div>
            </Panel>
            <Panel title="As-built spectrum against the design" className="min-w-0">
              {spectrum?.wavelengthNm?.length ? (
                <SpectrumPlot spectrum={spectrum} />
              ) : (
                <p className="text-sm text-ink-soft">{spectrum?.wavelengthNm ? "No spectrum: the design's materials have no index over the run's range (see the run's warnings)." : 'No spectrum stored.'}</p>
              )}
            </Panel>
            <Panel title="Chips and tooling" className="min-w-0">
              <ChipTable chips={chipRows(done) as ChipView[]} />
              <h3 className="mt-4 mb-2 text-sm font-semibold">Tooling check against the crystal</h3>
              <ToolingList tooling={tooling.map((t) => ({ ...t, label: labelOf(t.material) }))} />
            </Panel>
          </div>
        </>
      ) : null}
      <Panel title="Discussion">
        <NoteList notes={comments} kind="comment" runId={run.id} me={user.id} change={writes ? changeOwnNote : null} empty="No comments yet." />
        {writes ? <CommentForm runId={run.id} add={addComment} /> : null}
      </Panel>
      <Panel title="Analyses of this run" className="mt-6">
        <p className="mb-2 text-xs text-ink-faint">Every result is kept; the newest of each mode is the one shown unless an earlier one is picked.</p>
        <AnalysisHistory runId={run.id} entries={history} shownId={current?.analysis.id} newestIds={newestIds} />
      </Panel>
      {can(user.role, 'reanalyseRuns') ? (
        <Panel title="Analyse again with other settings" className="mt-6">
          <QueryProvider>
            <ReanalyseForm runId={run.id} />
          </QueryProvider>
        </Panel>
      ) : null}
    </>
  );
}
