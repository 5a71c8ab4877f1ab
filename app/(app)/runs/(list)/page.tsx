import type { Metadata } from 'next';
import Link from 'next/link';
import { QueryProvider } from '@/components/query/QueryProvider';
import { RunsBrowser } from '@/components/runs/RunsBrowser';
import { fromSearchParams } from '@/components/runs/runsQuery';
import { PageHeader, Panel } from '@/components/ui/Page';
import { listChambers } from '@/db/queries/chambers';
import { listDesignRevisions } from '@/db/queries/designs';
import { searchRuns } from '@/db/queries/runList';
import { runSummaryJson } from '@/app/_lib/api/json';
import { queryObject, runsQuerySchema } from '@/app/_lib/api/runsQuery';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';

export const metadata: Metadata = { title: 'Runs' };

type SearchParams = Record<string, string | string[] | undefined>;

export default async function RunsPage({ searchParams }: { searchParams?: Promise<SearchParams> }) {
  const user = await requireCapability('viewRuns');
  const initialQuery = fromSearchParams((await searchParams) ?? {});
  // A hand-edited URL with a bad value shows the unfiltered list rather than an error page.
  const parsed = runsQuerySchema.safeParse(queryObject(new URLSearchParams(initialQuery as Record<string, string>)));
  const query = parsed.success ? parsed.data : runsQuerySchema.parse({});
  const [{ rows, total }, chambers, revisions] = await Promise.all([searchRuns(query), listChambers(), listDesignRevisions()]);
  const initialPage = { runs: rows.map(runSummaryJson), total, page: query.page, pageSize: query.pageSize };
  const options = { designs: [...new Set(revisions.map((r) => r.designName))], chambers: chambers.map((c) => c.name) };
  return (
    <>
      <PageHeader title="Runs" lead="Every coating run with a stored monitor trace, how far its worst layer was cut from the design, and which runs need a look.">
        {can(user.role, 'uploadRuns') ? (
          <Link href="/runs/upload" className="rounded-md bg-fringe px-4 py-2 text-sm font-medium text-paper-raised hover:bg-fringe-dark">
            Upload traces
          </Link>
        ) : null}
      </PageHeader>
      <Panel>
        <QueryProvider>
          <RunsBrowser initialQuery={parsed.success ? initialQuery : {}} initialPage={initialPage} options={options} />
        </QueryProvider>
      </Panel>
    </>
  );
}
