import type { Metadata } from 'next';
import Link from 'next/link';
import { ImportDesignForm } from '@/components/designs/ImportDesignForm';
import { formatDate } from '@/components/runs/format';
import { PageHeader, Panel } from '@/components/ui/Page';
import { listDesigns } from '@/db/queries/designs';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { importDesign } from './actions';

export const metadata: Metadata = { title: 'Designs' };

export default async function DesignsPage() {
  const user = await requireCapability('viewDesigns');
  const designs = await listDesigns();
  return (
    <>
      <PageHeader title="Designs" lead="The shop's coating designs. Every save is a new revision; a run is always read against the revision it was made with." />
      <div className="flex flex-col gap-6">
        <Panel>
          {designs.length === 0 ? (
            <p className="text-ink-soft">No designs yet.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm" data-testid="designs-table">
                <thead className="text-xs uppercase tracking-wider text-ink-faint">
                  <tr>
                    <th className="pb-2 pr-4 font-medium">Design</th>
                    <th className="pb-2 pr-4 text-right font-medium">Revision</th>
                    <th className="pb-2 pr-4 text-right font-medium">Layers</th>
                    <th className="hidden pb-2 pr-4 text-right font-medium sm:table-cell">
                      <span className="normal-case">λ</span> ref nm
                    </th>
                    <th className="pb-2 pr-4 text-right font-medium">Runs</th>
                    <th className="hidden pb-2 font-medium sm:table-cell">Last saved</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-paper-line">
                  {designs.map((d) => (
                    <tr key={d.id} data-design={d.name}>
                      <td className="min-w-40 py-2 pr-4">
                        <Link className="text-fringe underline-offset-2 hover:underline" href={`/designs/${d.id}`}>
                          {d.name}
                        </Link>
                      </td>
                      <td className="py-2 pr-4 text-right font-mono">{d.revision}</td>
                      <td className="py-2 pr-4 text-right font-mono">{d.layerCount}</td>
                      <td className="hidden py-2 pr-4 text-right font-mono sm:table-cell">{d.referenceWavelengthNm}</td>
                      <td className="py-2 pr-4 text-right font-mono">{d.runs}</td>
                      <td className="hidden py-2 font-mono text-xs whitespace-nowrap text-ink-soft sm:table-cell">{formatDate(d.updatedAt)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Panel>
        {can(user.role, 'editDesigns') ? (
          <Panel title="Import a design">
            <ImportDesignForm action={importDesign} />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
