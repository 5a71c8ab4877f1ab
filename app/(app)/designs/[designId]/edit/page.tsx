import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { materialLibrary } from '@/analysis/materials';
import { DesignEditor } from '@/components/designs/DesignEditor';
import { PageHeader, Panel } from '@/components/ui/Page';
import { listShopMaterials } from '@/db/queries/materials';
import { requireCapability } from '@/app/_lib/auth';
import { designAndRevision } from '@/app/_lib/designApi';
import { saveDesign } from '../../actions';

export const metadata: Metadata = { title: 'Edit design' };

type Props = { params: Promise<{ designId: string }>; searchParams: Promise<{ revision?: string }> };

export default async function EditDesignPage({ params, searchParams }: Props) {
  await requireCapability('editDesigns');
  const found = await designAndRevision((await params).designId, (await searchParams).revision ?? null);
  if (!found.ok) notFound();
  const { design, revision } = found;
  const doc = revision.document as { materials?: Record<string, unknown> };
  const materials = {
    design: Object.keys(doc.materials ?? {}),
    shop: (await listShopMaterials()).map((m) => m.name),
    builtIn: Object.keys(materialLibrary),
  };
  return (
    <>
      <PageHeader title={`Edit ${design.name}`} lead={`Starting from revision ${revision.revision}. Saving stores revision ${design.revisions[0].revision + 1}; nothing is changed until you save.`}>
        <Link className="rounded-md border border-paper-line bg-paper-raised px-3 py-1.5 text-sm font-medium hover:bg-paper-sunk" href={`/designs/${design.id}?revision=${revision.revision}`}>
          Back without saving
        </Link>
      </PageHeader>
      <Panel>
        <DesignEditor designId={design.id} document={revision.document} materials={materials} save={saveDesign} />
      </Panel>
    </>
  );
}
