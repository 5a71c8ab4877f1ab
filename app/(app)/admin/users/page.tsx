import type { Metadata } from 'next';
import { InviteUserForm } from '@/components/admin/InviteUserForm';
import { ActiveControl, ResendInviteControl, RoleControl } from '@/components/admin/UserControls';
import { Badge, PageHeader, Panel } from '@/components/ui/Page';
import { roles } from '@/db/schema';
import { listUsers } from '@/db/queries/users';
import { requireCapability } from '@/app/_lib/auth';
import { roleLabels } from '@/app/_lib/capabilities';
import { changeRole, inviteUser, resendInvite, setActive } from './actions';

export const metadata: Metadata = { title: 'Users' };

const statusTone = { active: 'fringe', invited: 'brass', deactivated: 'alarm' } as const;

export default async function UsersPage() {
  const me = await requireCapability('manageUsers');
  const users = await listUsers();
  const roleOptions = roles.map((r) => ({ value: r, label: roleLabels[r] }));
  return (
    <>
      <PageHeader title="Users" lead="Invite people by e-mail, set what their role lets them do, and deactivate accounts that should no longer sign in." />
      <Panel title="Invite someone" className="mb-6">
        <InviteUserForm action={inviteUser} roles={roleOptions} />
      </Panel>
      <Panel title={`${users.length} people`}>
        <table className="block w-full text-left text-sm md:table">
          <thead className="hidden text-xs uppercase tracking-wider text-ink-faint md:table-header-group">
            <tr>
              <th className="pb-2 font-medium">Name</th>
              <th className="pb-2 font-medium">Status</th>
              <th className="pb-2 font-medium">Role</th>
              <th className="pb-2 font-medium">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody className="block divide-y divide-paper-line md:table-row-group">
            {users.map((u) => (
              <tr key={u.id} data-user-email={u.email} className="flex flex-wrap items-center gap-x-4 gap-y-2 py-3 md:table-row md:py-0">
                <td className="block w-full min-w-0 md:table-cell md:w-auto md:py-3 md:pr-4">
                  <div className="font-medium">{u.name}</div>
                  <div className="font-mono text-xs break-all text-ink-faint">{u.email}</div>
                </td>
                <td className="block md:table-cell md:py-3 md:pr-4">
                  <Badge tone={statusTone[u.status]}>{u.status}</Badge>
                </td>
                <td className="block md:table-cell md:py-3 md:pr-4">
                  <RoleControl action={changeRole} userId={u.id} role={u.role} roles={roleOptions} />
                </td>
                <td className="block md:table-cell md:py-3">
                  <div className="flex flex-wrap gap-2 md:justify-end">
                    {u.status === 'invited' ? <ResendInviteControl action={resendInvite} userId={u.id} /> : null}
                    {u.id !== me.id && u.status !== 'invited' ? <ActiveControl action={setActive} userId={u.id} active={u.status === 'active'} /> : null}
                    {u.status === 'invited' ? <ActiveControl action={setActive} userId={u.id} active /> : null}
                  </div>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Panel>
    </>
  );
}
