import type { Metadata } from 'next';
import { ChangePasswordForm } from '@/components/account/ChangePasswordForm';
import { PageHeader, Panel } from '@/components/ui/Page';
import { requireCapability } from '@/app/_lib/auth';
import { roleLabels } from '@/app/_lib/capabilities';
import { changePassword } from './actions';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const user = await requireCapability('changeOwnPassword');
  return (
    <>
      <PageHeader title="Account" lead={`${user.name} · ${user.email} · ${roleLabels[user.role]}`} />
      <Panel title="Change password">
        <ChangePasswordForm action={changePassword} />
      </Panel>
    </>
  );
}
