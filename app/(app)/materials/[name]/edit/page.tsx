import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { MaterialForm } from '@/components/materials/MaterialForm';
import { PageHeader, Panel } from '@/components/ui/Page';
import { findShopMaterial } from '@/db/queries/materials';
import { requireCapability } from '@/app/_lib/auth';
import { nameParam } from '@/app/_lib/materialView';
import { updateMaterial } from '../../actions';

export const metadata: Metadata = { title: 'Edit material' };

/** Shop materials only: a built-in entry has no edit page (404). */
export default async function EditMaterialPage({ params }: { params: Promise<{ name: string }> }) {
  await requireCapability('editDesigns');
  const row = await findShopMaterial(nameParam((await params).name));
  if (!row) notFound();
  return (
    <>
      <PageHeader title={`Edit ${row.name}`} lead="Design revisions already saved keep the copy of the model they carry; the next save of a design that names this material takes the new one." />
      <Panel>
        <MaterialForm action={updateMaterial} existing={{ name: row.name, model: row.model, description: row.description, source: row.source }} />
      </Panel>
    </>
  );
}
