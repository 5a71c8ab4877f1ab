import type { Metadata } from 'next';
import Link from 'next/link';
import { materialLibrary, materialModelSchema } from '@/analysis/materials';
import { fixed } from '@/components/runs/format';
import { Badge, PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { listShopMaterials } from '@/db/queries/materials';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { kindLabels, modelSummary, nAt } from '@/app/_lib/materialView';
import { DataTable, type Column } from '@/components/ui/DataTable';

export const metadata: Metadata = { title: 'Materials' };

const columns: Column[] = [
  { key: 'name', label: 'Name' },
  { key: 'model', label: 'Model' },
  { key: 'n', label: 'n at 550 nm', right: true },
  { key: 'changed', label: 'Changed' },
];

const href = (name: string) => `/materials/${encodeURIComponent(name)}`;

export default async function MaterialsPage() {
  const user = await requireCapability('viewDesigns');
  const shop = await listShopMaterials();
  return (
    <>
      <PageHeader title="Materials" lead="The shop's own coating materials, then the built-in library. Designs name them; each saved design revision keeps a copy of the models it used.">
        {can(user.role, 'editDesigns') ? (
          <Link className="rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised hover:bg-fringe-dark" href="/materials/new">
            New material
          </Link>
        ) : null}
      </PageHeader>
      <div className="flex flex-col gap-6">
        <Panel title="Shop materials">
          {shop.length === 0 ? (
            <p className="text-ink-soft" data-testid="shop-materials-empty">
              None yet. {can(user.role, 'editDesigns') ? 'Create one from what your chambers deposit.' : 'An engineer adds them.'}
            </p>
          ) : (
            <DataTable columns={columns} testId="shop-materials">
              {shop.map((m) => {
                const model = materialModelSchema.safeParse(m.model);
                return (
                  <tr key={m.id} data-material={m.name}>
                    <td className="py-2 pr-4">
                      <Link className="text-fringe underline-offset-2 hover:underline" href={href(m.name)}>
                        {m.name}
                      </Link>
                    </td>
                    <td className="py-2 pr-4 text-ink-soft">{model.success ? modelSummary(model.data) : 'stored model no longer valid'}</td>
                    <td className="py-2 pr-4 text-right font-mono">{fixed(nAt(model.success ? model.data : null, 550), 4)}</td>
                    <td className="py-2 font-mono text-xs whitespace-nowrap text-ink-soft">{formatTime(m.updatedAt)}</td>
                  </tr>
                );
              })}
            </DataTable>
          )}
        </Panel>
        <Panel title="Built-in library (read-only)">
          <ul className="divide-y divide-paper-line text-sm" data-testid="builtin-materials">
            {Object.values(materialLibrary).map((m) => (
              <li key={m.name} data-material={m.name} className="flex flex-col gap-1 py-2.5">
                <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
                  <Link className="font-medium text-fringe underline-offset-2 hover:underline" href={href(m.name)}>
                    {m.name}
                  </Link>
                  <Badge tone={m.kind === 'published-fit' ? 'fringe' : m.kind === 'from-memory' ? 'brass' : 'plain'}>{kindLabels[m.kind]}</Badge>
                  <span className="font-mono text-xs text-ink-soft">n(550 nm) = {fixed(nAt(m.model, 550), 4)}</span>
                </div>
                <p className="text-xs text-ink-soft">{m.source}</p>
              </li>
            ))}
          </ul>
        </Panel>
      </div>
    </>
  );
}
