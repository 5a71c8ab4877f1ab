import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { cutPlan, parseDesign, singleLayerRule, type Design } from '@/analysis/design';
import { CutPlanTable } from '@/components/designs/CutPlanTable';
import { DesignLayersTable } from '@/components/designs/DesignLayersTable';
import { MonitorCurves } from '@/components/designs/MonitorCurves';
import { SingleLayerRulePanel } from '@/components/designs/SingleLayerRulePanel';
import { SpectrumPlot } from '@/components/designs/SpectrumPlot';
import { FormMessage } from '@/components/forms';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { runsOfRevision } from '@/db/queries/designs';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { designAndRevision } from '@/app/_lib/designApi';

export const metadata: Metadata = { title: 'Design' };

type Props = { params: Promise<{ designId: string }>; searchParams: Promise<{ revision?: string }> };

const button = 'rounded-md border border-paper-line bg-paper-raised px-3 py-1.5 text-sm font-medium hover:bg-paper-sunk';

export default async function DesignPage({ params, searchParams }: Props) {
  const user = await requireCapability('viewDesigns');
  const found = await designAndRevision((await params).designId, (await searchParams).revision ?? null);
  if (!found.ok) notFound();
  const { design: row, revision } = found;
  const newest = row.revisions[0].revision;
  let design: Design | null = null;
  let fault: string | null = null;
  try {
    design = parseDesign(revision.document);
  } catch (e) {
    fault = (e as Error).message;
  }
  const plan = design ? cutPlan(design) : [];
  const rule = design ? singleLayerRule(design) : null;
  const runs = await runsOfRevision(revision.id);
  const older = row.revisions.find((r) => r.revision < revision.revision)?.revision;

  return (
    <>
      <PageHeader
        title={row.name}
        lead={`Revision ${revision.revision}${revision.revision === newest ? ' (newest)' : ` of ${newest}`}, saved ${formatTime(revision.createdAt)}; ${revision.layerCount} layers, reference wavelength ${revision.referenceWavelengthNm} nm.`}
      >
        <div className="flex flex-wrap gap-2">
          {can(user.role, 'editDesigns') ? (
            <Link className={button} href={`/designs/${row.id}/edit?revision=${revision.revision}`}>
              Edit{revision.revision === newest ? '' : ' from this revision'}
            </Link>
          ) : null}
          <a className={button} href={`/api/designs/${row.id}/export?revision=${revision.revision}`} download>
            Export JSON
          </a>
          {older ? (
            <Link className={button} href={`/designs/${row.id}/compare?a=${older}&b=${revision.revision}`}>
              Compare with rev. {older}
            </Link>
          ) : null}
        </div>
      </PageHeader>
      {fault || !design ? (
        <FormMessage tone="error">This revision no longer parses: {fault}</FormMessage>
      ) : (
        <div className="flex flex-col gap-6">
          <Panel title="Layers">
            <DesignLayersTable design={design} />
          </Panel>
          <Panel title="Spectrum">
            <SpectrumPlot sources={[{ label: `rev. ${revision.revision}`, document: revision.document }]} referenceWavelengthNm={design.referenceWavelengthNm} />
          </Panel>
          <Panel title="Cut plan">
            <p className="mb-3 text-sm text-ink-soft" data-testid="advisory">
              Fringelog&apos;s figures are advisory; cut decisions follow your shop&apos;s procedures.
            </p>
            <CutPlanTable plan={plan} />
          </Panel>
          <Panel title="Expected monitor curves">
            <MonitorCurves document={revision.document} />
          </Panel>
          {rule ? (
            <Panel title="Single-layer rule">
              <SingleLayerRulePanel rule={rule} />
            </Panel>
          ) : null}
          <div className="grid gap-6 md:grid-cols-2">
            <Panel title="Revisions">
              <ul className="divide-y divide-paper-line text-sm" data-testid="revisions">
                {row.revisions.map((r) => (
                  <li key={r.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2" data-revision={r.revision}>
                    <Link className={`underline-offset-2 hover:underline ${r.revision === revision.revision ? 'font-semibold text-ink' : 'text-fringe'}`} href={`/designs/${row.id}?revision=${r.revision}`}>
                      Revision {r.revision}
                    </Link>
                    <span className="text-xs text-ink-faint">
                      {formatTime(r.createdAt)} · {r.createdByName ?? '–'} · {r.layerCount} layers · {r.runs} run{r.runs === 1 ? '' : 's'}
                    </span>
                  </li>
                ))}
              </ul>
              {row.revisions.length > 1 ? (
                <form action={`/designs/${row.id}/compare`} className="mt-3 flex flex-wrap items-end gap-2 text-sm">
                  {(['a', 'b'] as const).map((k, i) => (
                    <label key={k} className="flex flex-col gap-1">
                      <span className="text-ink-soft">{i === 0 ? 'Compare revision' : 'with revision'}</span>
                      <select name={k} defaultValue={i === 0 ? (older ?? newest) : revision.revision} className="rounded-md border border-paper-line bg-paper-raised px-2 py-1">
                        {row.revisions.map((r) => (
                          <option key={r.revision} value={r.revision}>
                            {r.revision}
                          </option>
                        ))}
                      </select>
                    </label>
                  ))}
                  <button type="submit" className={button}>
                    Compare
                  </button>
                </form>
              ) : null}
            </Panel>
            <Panel title="Runs made with this revision">
              {runs.length === 0 ? (
                <p className="text-sm text-ink-soft">None yet.</p>
              ) : (
                <ul className="flex flex-wrap gap-2 text-sm" data-testid="revision-runs">
                  {runs.map((r) => (
                    <li key={r.id}>
                      <Link className="font-mono text-fringe underline-offset-2 hover:underline" href={`/runs/${r.id}`}>
                        {r.runCode}
                      </Link>
                    </li>
                  ))}
                </ul>
              )}
            </Panel>
          </div>
        </div>
      )}
    </>
  );
}
