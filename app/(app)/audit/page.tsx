import type { Metadata } from 'next';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { formatBytes } from '@/components/runs/format';
import { dispositionLooks, type DispositionValue } from '@/components/runs/disposition';
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
  'run.disposition_set': 'recorded the disposition of run',
  'run.annotation_added': 'pinned a note on run',
  'run.annotation_edited': 'edited their note on run',
  'run.annotation_deleted': 'deleted their note on run',
  'run.comment_added': 'commented on run',
  'run.comment_edited': 'edited their comment on run',
  'run.comment_deleted': 'deleted their comment on run',
  'material.created': 'created the material',
  'material.updated': 'changed the material',
  'material.index_adopted': 'adopted the runs\' fitted index for the material',
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

function dispositionWord(value: unknown): string {
  return typeof value === 'string' && value in dispositionLooks ? dispositionLooks[value as DispositionValue].word : String(value);
}

function role(value: unknown): string {
  return typeof value === 'string' && value in roleLabels ? roleLabels[value as Role] : String(value);
}

function details(e: AuditRow): string {
  const d = e.detail;
  if (e.action === 'user.role_changed') return `${role(d.from)} → ${role(d.to)}`;
  if (e.action === 'user.invited') return `as ${role(d.role)}, ${String(d.email)}`;
  if (e.action === 'design.revision_created') return `revision ${String(d.revision)}${typeof d.via === 'string' && d.via !== 'uploaded' ? `, ${d.via}` : ''}`;
  if (e.action === 'material.index_adopted') return `n = ${String(d.index)} at ${String(d.wavelengthNm)} nm (was ${String(d.previousIndex)})`;
  if (e.action === 'material.created' || e.action === 'material.updated') return typeof d.after === 'object' || typeof d.model === 'object' ? 'model stored with the event' : '';
  if (e.action === 'run.uploaded' && typeof d.bytes === 'number') return `${String(d.file)}, ${formatBytes(d.bytes)}${d.chamberToken ? `, by chamber token #${String(d.chamberToken)}` : ''}`;
  if (e.action.startsWith('chamber_token.')) return `${typeof d.label === 'string' ? d.label : 'demo token'} (chamber #${String(d.chamberId)})`;
  if (e.action === 'run.disposition_set') return `${dispositionWord(d.disposition)}: ${String(d.reason)}${d.was ? ` (was ${dispositionWord(d.was)})` : ''}`;
  if (/^run\.(annotation|comment)_/.test(e.action)) return [d.was !== undefined ? `was “${String(d.was)}”` : null, d.now !== undefined || d.body !== undefined ? `“${String(d.now ?? d.body)}”` : null].filter(Boolean).join(' → ');
  return Object.entries(d)
    .map(([k, v]) => `${k}: ${typeof v === 'string' ? v : JSON.stringify(v)}`)
    .join(' · ');
}

/** Users by name; designs and runs by the name or code recorded with the event. */
function targetLabel(e: AuditRow): string {
  if (e.targetType === 'user' && e.targetName) return e.targetName;
  if (e.targetType === 'design' && typeof e.detail.name === 'string') return e.detail.name;
  if (e.targetType === 'run' && typeof e.detail.runCode === 'string') return e.detail.runCode;
  if (e.targetType === 'material' && typeof e.detail.name === 'string') return e.detail.name;
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
          <table className="block w-full text-left text-sm md:table">
            <thead className="hidden text-xs uppercase tracking-wider text-ink-faint md:table-header-group">
              <tr>
                <th className="pb-2 font-medium">When</th>
                <th className="pb-2 font-medium">What happened</th>
                <th className="pb-2 font-medium">Details</th>
                <th className="pb-2 font-medium">Event</th>
              </tr>
            </thead>
            <tbody className="block divide-y divide-paper-line md:table-row-group">
              {events.map((e) => (
                <tr key={e.id} data-audit-action={e.action} className="block py-2 md:table-row md:py-0">
                  <td className="block font-mono text-xs text-ink-soft md:table-cell md:py-2 md:pr-4 md:whitespace-nowrap">{formatTime(e.at)}</td>
                  <td className="block break-words md:table-cell md:py-2 md:pr-4">{sentence(e)}</td>
                  <td className="block break-words text-ink-soft md:table-cell md:py-2 md:pr-4">{details(e)}</td>
                  <td className="hidden font-mono text-xs text-ink-faint md:table-cell md:py-2">{e.action}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
    </>
  );
}
