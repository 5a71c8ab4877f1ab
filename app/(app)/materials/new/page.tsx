import type { Metadata } from 'next';
import { MaterialForm } from '@/components/materials/MaterialForm';
import { PageHeader, Panel } from '@/components/ui/Page';
import { requireCapability } from '@/app/_lib/auth';
import { createMaterial } from '../actions';

export const metadata: Metadata = { title: 'New material' };

export default async function NewMaterialPage() {
  await requireCapability('editDesigns');
  return (
    <>
      <PageHeader title="New material" lead="A coating material as your chambers deposit it. Designs can name it once it is saved." />
      <Panel>
        <MaterialForm action={createMaterial} />
      </Panel>
    </>
  );
}
