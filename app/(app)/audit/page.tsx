import type { Metadata } from 'next';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { listAudit } from '@/db/queries/audit';
import { requireCapability } from '@/app/_lib/auth';

export const metadata: Metadata = { title: 'Audit log' };

function describe(detail: Record<string, unknown>): string {
  return Object.entries(detail)
    .map(([k, v]) => `${k}: ${typeof v === 'string' ? v : JSON.stringify(v)}`)
    .join(' · ');
}

export default async function AuditPage() {
  await requireCapability('viewAuditLog');
  const events = await listAudit();
  return (
    <>
      <PageHeader title="Audit log" lead="Who changed what, newest first: accounts and roles now; designs and runs as they arrive." />
      <Panel>
        {events.length === 0 ? (
          <p className="text-ink-soft">Nothing has been changed yet.</p>
        ) : (
          <table className="w-full text-left text-sm">
            <thead className="text-xs uppercase tracking-wider text-ink-faint">
              <tr>
                <th className="pb-2 font-medium">When</th>
                <th className="pb-2 font-medium">Who</th>
                <th className="pb-2 font-medium">What</th>
                <th className="pb-2 font-medium">Details</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-paper-line">
              {events.map((e) => (
                <tr key={e.id}>
                  <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap">{formatTime(e.at)}</td>
                  <td className="py-2 pr-4">{e.actorName ?? <span className="text-ink-faint">system</span>}</td>
                  <td className="py-2 pr-4 font-mono text-xs">
                    {e.action} {e.targetType}
                    {e.targetId ? ` #${e.targetId}` : ''}
                  </td>
                  <td className="py-2 text-ink-soft">{describe(e.detail)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
    </>
  );
}
