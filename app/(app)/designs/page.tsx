import type { Metadata } from 'next';
import Link from 'next/link';
import { ImportDesignForm } from '@/components/designs/ImportDesignForm';
import { formatDate } from '@/components/runs/format';
import { PageHeader, Panel } from '@/components/ui/Page';
import { listDesigns } from '@/db/queries/designs';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { importDesign } from './actions';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'design', label: 'Design' },
  { key: 'revision', label: 'Revision', right: true },
  { key: 'layers', label: 'Layers', right: true },
  {
    key: 'ref',
    label: (
      <>
        <span className="normal-case">λ</span> ref nm
      </>
    ),
    right: true,
    className: 'hidden sm:table-cell',
  },
  { key: 'runs', label: 'Runs', right: true },
  { key: 'saved', label: 'Last saved', className: 'hidden sm:table-cell' },
];

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
            <DataTable columns={columns} testId="designs-table">
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
            </DataTable>
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
