import type { Metadata } from 'next';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { formatBytes } from '@/components/runs/format';
import { listAudit, type AuditRow } from '@/db/queries/audit';
import { requireCapability } from '@/app/_lib/auth';
import { roleLabels, type Role } from '@/app/_lib/capabilities';

export const metadata: Metadata = { title: 'Audit log' };

const verbs: Record<string, string> = {
  'user.invited': 'invited',
  'user.invite_resent': 'sent a new invitation link to',
  'user.invite_accepted': 'accepted the invitation of',
  'user.role_changed': 'changed the role of',
  'user.deactivated': 'deactivated',
  'user.reactivated': 'reactivated',
  'user.password_changed': 'changed the password of',
  'user.reset_requested': 'received a password-reset request for',
  'user.password_reset': 'reset the password of',
  'design.revision_created': 'stored a revision of design',
  'run.uploaded': 'stored the trace of run',
  'run.reanalysis_queued': 'queued a new analysis of run',
  'chamber_token.created': 'created chamber token',
  'chamber_token.revoked': 'revoked chamber token',
};

/** Phrases for what people do to their own account. */
const ownVerbs: Record<string, string> = {
  'user.invite_accepted': 'accepted the invitation and chose a password',
  'user.password_changed': 'changed their password',
  'user.password_reset': 'set a new password through a reset link',
};

function role(value: unknown): string {
  return typeof value === 'string' && value in roleLabels ? roleLabels[value as Role] : String(value);
}

function details(e: AuditRow): string {
  const d = e.detail;
  if (e.action === 'user.role_changed') return `${role(d.from)} → ${role(d.to)}`;
  if (e.action === 'user.invited') return `as ${role(d.role)}, ${String(d.email)}`;
  if (e.action === 'design.revision_created') return `revision ${String(d.revision)}`;
  if (e.action === 'run.uploaded' && typeof d.bytes === 'number') return `${String(d.file)}, ${formatBytes(d.bytes)}${d.chamberToken ? `, by chamber token #${String(d.chamberToken)}` : ''}`;
  if (e.action.startsWith('chamber_token.')) return `${typeof d.label === 'string' ? d.label : 'demo token'} (chamber #${String(d.chamberId)})`;
  return Object.entries(d)
    .map(([k, v]) => `${k}: ${typeof v === 'string' ? v : JSON.stringify(v)}`)
    .join(' · ');
}

/** Users by name; designs and runs by the name or code recorded with the event. */
function targetLabel(e: AuditRow): string {
  if (e.targetType === 'user' && e.targetName) return e.targetName;
  if (e.targetType === 'design' && typeof e.detail.name === 'string') return e.detail.name;
  if (e.targetType === 'run' && typeof e.detail.runCode === 'string') return e.detail.runCode;
  if (e.targetType === 'chamber_token' && typeof e.detail.hint === 'string') return e.detail.hint;
  return `${e.targetType}${e.targetId ? ` #${e.targetId}` : ''}`;
}

function sentence(e: AuditRow): React.ReactNode {
  const actor = <span className="font-medium">{e.actorName ?? 'Fringelog'}</span>;
  const own = e.targetType === 'user' && e.actorName !== null && e.actorName === e.targetName;
  if (own && ownVerbs[e.action]) return <>{actor} {ownVerbs[e.action]}</>;
  const target = targetLabel(e);
  return (
    <>
      {actor} {verbs[e.action] ?? e.action} <span className="font-medium">{target}</span>
    </>
  );
}

export default async function AuditPage() {
  await requireCapability('viewAuditLog');
  const events = await listAudit();
  return (
    <>
      <PageHeader title="Audit log" lead="Who changed what, newest first: accounts and roles, designs and stored runs." />
      <Panel>
        {events.length === 0 ? (
          <p className="text-ink-soft">Nothing has been changed yet.</p>
        ) : (
          <table className="w-full text-left text-sm">
            <thead className="text-xs uppercase tracking-wider text-ink-faint">
              <tr>
                <th className="pb-2 font-medium">When</th>
                <th className="pb-2 font-medium">What happened</th>
                <th className="pb-2 font-medium">Details</th>
                <th className="pb-2 font-medium">Event</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-paper-line">
              {events.map((e) => (
                <tr key={e.id} data-audit-action={e.action}>
                  <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap text-ink-soft">{formatTime(e.at)}</td>
                  <td className="py-2 pr-4">{sentence(e)}</td>
                  <td className="py-2 pr-4 text-ink-soft">{details(e)}</td>
                  <td className="py-2 font-mono text-xs text-ink-faint">{e.action}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
    </>
  );
}
