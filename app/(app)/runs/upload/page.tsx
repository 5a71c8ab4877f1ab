import type { Metadata } from 'next';
import { QueryProvider } from '@/components/query/QueryProvider';
import { UploadDesk } from '@/components/upload/UploadDesk';
import { PageHeader } from '@/components/ui/Page';
import { listChambers } from '@/db/queries/chambers';
import { listDesignRevisions } from '@/db/queries/designs';
import { requireCapability } from '@/app/_lib/auth';

export const metadata: Metadata = { title: 'Upload traces' };

export default async function UploadPage() {
  await requireCapability('uploadRuns');
  const [revisions, chambers] = await Promise.all([listDesignRevisions(), listChambers()]);
  const designs = revisions.map((r) => ({ name: r.designName, revision: r.revision, layerCount: r.layerCount }));
  return (
    <>
      <PageHeader
        title="Upload traces"
        lead="Bring in a finished run's optical-monitor trace. Fringelog stores it as it is, checks every row, and analyses it layer by layer and with the joint re-fit."
      />
      <QueryProvider>
        <UploadDesk designs={designs} chambers={chambers.map((c) => c.name)} />
      </QueryProvider>
    </>
  );
}
