import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { dispositionLooks } from '@/components/runs/disposition';
import { NoteList } from '@/components/runs/NoteList';
import { ReportIndexPlot, ReportTrace } from '@/components/runs/ReportCharts';
import { ReportLayerTable } from '@/components/runs/ReportLayerTable';
import { formatDate } from '@/components/runs/format';
import { formatTime } from '@/components/ui/Page';
import { latestAnalyses } from '@/db/queries/analyses';
import { dispositionAuthor, listAnnotations, listComments, runDesignDocument } from '@/db/queries/review';
import { findRun } from '@/db/queries/runs';
import { findOverview } from '@/db/queries/series';
import { requireCapability } from '@/app/_lib/auth';
import { designOf, driftRows, layerRows, materialNames, parseRunId, traceSpans } from '../runView';

export const metadata: Metadata = { title: 'Run report' };

/** A report section; from the second on, each starts a new printed page. */
function Section({ title, children, newPage = true, testId }: { title: string; children: React.ReactNode; newPage?: boolean; testId?: string }) {
  return (
    <section className={`mt-8 ${newPage ? 'print:break-before-page' : ''} print:mt-0`} data-testid={testId}>
      <h2 className="mb-2 border-b border-ink/40 pb-1 text-sm font-semibold uppercase tracking-wider">{title}</h2>
      {children}
    </section>
  );
}

const signers = ['Operator', 'Process engineer', 'Supervisor'];

/**
 * The run on paper for sign-off: what was coated where and by whom, the newest analysis (joint
 * re-fit when there is one) with its plots, the notes, the disposition and lines to sign.
 */
export default async function RunReportPage({ params }: { params: Promise<{ runId: string }> }) {
  await requireCapability('viewRuns');
  const id = parseRunId((await params).runId);
  const found = id === null ? undefined : await findRun(id);
  if (!found) notFound();
  const { run, design, chamber } = found;
  const [byMode, annotations, comments, decidedBy, stored] = await Promise.all([
    latestAnalyses(run.id), listAnnotations(run.id), listComments(run.id), dispositionAuthor(run.dispositionBy), runDesignDocument(run.id),
  ]);
  const chosen = byMode.refit?.analysis.state === 'done' ? byMode.refit : byMode.sequential;
  const done = chosen?.analysis.state === 'done' ? chosen : undefined;
  const names = materialNames(stored?.document);
  const layers = done ? layerRows(done, designOf(stored?.document), null, names) : [];
  const drift = done ? driftRows(done) : [];
  const overview = done ? await findOverview(done.analysis.id) : undefined;
  const wavelengths = [...new Set(layers.map((l) => l.wavelengthNm).filter((w) => w !== null))];
  const look = run.disposition ? dispositionLooks[run.disposition] : null;
  const facts: [string, string][] = [
    ['Design', `${design.name}, revision ${design.revision} (${design.layerCount} layers)`],
    ['Chamber', chamber.name],
    ['Shift', run.shift ?? '–'],
    ['Operator', found.operatorUserName ?? run.operatorName ?? '–'],
    ['Date', formatDate(run.startedAt)],
    ['Analysis', done ? `${done.analysis.mode === 'refit' ? 'joint re-fit' : 'layer by layer'}, finished ${done.analysis.finishedAt ? formatTime(done.analysis.finishedAt) : '–'}` : 'none finished'],
  ];

  return (
    <article className="mx-auto max-w-[720px] text-sm print:max-w-none" data-testid="run-report">
      <p className="mb-4 flex gap-4 print:hidden">
        <Link href={`/runs/${run.id}`} className="text-fringe underline-offset-2 hover:underline">← Back to the run</Link>
        <span className="text-ink-faint">Print from the browser (A4 portrait) or save as PDF.</span>
      </p>
      <header className="border-b-2 border-ink pb-2">
        <p className="font-mono text-xs text-ink-faint">Larkspur Optical Works · run report · printed from Fringelog</p>
        <h1 className="text-xl font-semibold">Run {run.runCode}</h1>
      </header>
      <dl className="mt-3 grid grid-cols-3 gap-x-4 gap-y-2">
        {facts.map(([k, v]) => (
          <div key={k}>
            <dt className="text-[11px] uppercase tracking-wider text-ink-faint">{k}</dt>
            <dd>{v}</dd>
          </div>
        ))}
      </dl>
      <section className="mt-4 rounded-md border border-ink/40 p-3" data-testid="report-disposition">
        <h2 className="text-[11px] uppercase tracking-wider text-ink-faint">Disposition</h2>
        {look ? (
          <>
            <p className="font-semibold"><span aria-hidden="true" className="mr-1">{look.glyph}</span>{look.word}</p>
            <p>Reason: {run.dispositionReason || '–'}</p>
            <p className="text-xs text-ink-soft">Decided by {decidedBy ?? 'a former user'}{run.dispositionAt ? `, ${formatTime(run.dispositionAt)}` : ''}</p>
          </>
        ) : (
          <p className="font-semibold">Not decided</p>
        )}
      </section>
      <p className="mt-3 border-l-4 border-brass pl-3 text-xs" data-testid="advisory">
        Fringelog&apos;s figures are advisory estimates from the monitor trace; cut and disposition decisions follow the shop&apos;s own procedures.
      </p>
      <Section title="Results per layer" newPage={false}>
        {layers.length ? <ReportLayerTable layers={layers} /> : <p>No finished analysis of this run.</p>}
        <p className="mt-1 text-[11px] text-ink-faint">Cut errors graded against the design&apos;s tolerances, else the shop default: ● within, ▲ near the limit, ■ outside.</p>
      </Section>
      {done ? (
        <Section title="Trace and per-material index">
          <h3 className="mb-1 text-xs font-semibold">Measured reading, fitted model and cuts</h3>
          <ReportTrace
            runId={run.id}
            analysisId={done.analysis.id}
            overview={overview ? { ...overview, decimated: true } : null}
            spans={traceSpans(layers)}
            pins={annotations.map((a, i) => ({ id: a.id, timeS: a.timeS, layer: a.layer, number: i + 1 }))}
          />
          <h3 className="mt-4 mb-1 text-xs font-semibold">Fitted index against nominal, per material</h3>
          <ReportIndexPlot
            wavelengthNm={wavelengths.length === 1 ? wavelengths[0] : null}
            series={drift.map((d) => ({ ...d, label: names[d.material] ? `${d.material} · ${names[d.material]}` : d.material }))}
          />
        </Section>
      ) : null}
      <Section title="Notes on the trace and comments">
        <h3 className="mb-1 text-xs font-semibold">Notes pinned to the trace</h3>
        <NoteList notes={annotations} kind="annotation" runId={run.id} me={null} change={null} numbered empty="None." />
        <h3 className="mt-3 mb-1 text-xs font-semibold">Comments</h3>
        <NoteList notes={comments} kind="comment" runId={run.id} me={null} change={null} empty="None." />
        <div className="mt-8 break-inside-avoid" data-testid="report-signatures">
          <h2 className="mb-2 border-b border-ink/40 pb-1 text-sm font-semibold uppercase tracking-wider">Sign-off</h2>
          <table className="w-full border-collapse">
            <thead>
              <tr className="text-left text-[11px] text-ink-faint">
                <th className="w-1/4 py-1 font-normal">Role</th><th className="py-1 font-normal">Name</th><th className="py-1 font-normal">Signature</th><th className="w-1/6 py-1 font-normal">Date</th>
              </tr>
            </thead>
            <tbody>
              {signers.map((s) => (
                <tr key={s} className="h-12 align-bottom">
                  <td className="pb-1">{s}</td>
                  <td className="border-b border-ink pb-1" /><td className="border-b border-ink pb-1" /><td className="border-b border-ink pb-1" />
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Section>
    </article>
  );
}
