import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { layerDiff, parseDesign, type DesignLayer } from '@/analysis/design';
import { SpectrumPlot } from '@/components/designs/SpectrumPlot';
import { fixed } from '@/components/runs/format';
import { PageHeader, Panel } from '@/components/ui/Page';
import { requireCapability } from '@/app/_lib/auth';
import { designAndRevision } from '@/app/_lib/designApi';

export const metadata: Metadata = { title: 'Compare revisions' };

type Props = { params: Promise<{ designId: string }>; searchParams: Promise<{ a?: string; b?: string }> };

function describe(l: DesignLayer | null): string {
  if (!l) return '–';
  return `${l.material}, ${fixed(l.thicknessNm, 2)} nm, ${l.monitor.mode} ${l.monitor.wavelengthNm} nm chip ${l.monitor.chip}, ${l.monitor.cut === 'level' ? 'level' : 'turning point'}`;
}

const tone = { same: 'text-ink-faint', changed: 'bg-brass-light/60', added: 'bg-fringe-light/60', removed: 'bg-alarm-light/60' } as const;

export default async function CompareRevisionsPage({ params, searchParams }: Props) {
  await requireCapability('viewDesigns');
  const { designId } = await params;
  const { a, b } = await searchParams;
  const [first, second] = await Promise.all([designAndRevision(designId, a ?? null), designAndRevision(designId, b ?? null)]);
  if (!first.ok || !second.ok) notFound();
  const da = parseDesign(first.revision.document);
  const db = parseDesign(second.revision.document);
  const rows = layerDiff(da, db);
  const ra = first.revision.revision;
  const rb = second.revision.revision;
  const changed = rows.filter((r) => r.kind !== 'same').length;
  return (
    <>
      <PageHeader title={`${first.design.name}: revision ${ra} against ${rb}`} lead={changed ? `${changed} layer${changed === 1 ? ' differs' : 's differ'}.` : 'The layer tables are the same.'}>
        <Link className="rounded-md border border-paper-line bg-paper-raised px-3 py-1.5 text-sm font-medium hover:bg-paper-sunk" href={`/designs/${first.design.id}?revision=${rb}`}>
          Back to revision {rb}
        </Link>
      </PageHeader>
      <div className="flex flex-col gap-6">
        <Panel title="Layers">
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="layer-diff">
              <thead className="text-xs uppercase tracking-wider text-ink-faint">
                <tr>
                  <th className="pb-2 pr-3 font-medium">Layer</th>
                  <th className="pb-2 pr-3 font-medium">Revision {ra}</th>
                  <th className="pb-2 pr-3 font-medium">Revision {rb}</th>
                  <th className="pb-2 font-medium">Difference</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
                {rows.map((r, i) => (
                  <tr key={i} className={tone[r.kind]} data-diff={r.kind}>
                    <td className="py-1.5 pr-3 font-mono">{r.b ?? r.a}</td>
                    <td className="py-1.5 pr-3">{describe(r.before)}</td>
                    <td className="py-1.5 pr-3">{describe(r.after)}</td>
                    <td className="py-1.5">{r.kind === 'changed' ? r.changes.join(', ') : r.kind === 'same' ? 'same' : r.kind}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Panel>
        <Panel title="Spectra">
          <SpectrumPlot
            sources={[
              { label: `rev. ${ra}`, document: first.revision.document },
              { label: `rev. ${rb}`, document: second.revision.document },
            ]}
            referenceWavelengthNm={db.referenceWavelengthNm}
          />
        </Panel>
      </div>
    </>
  );
}
