import type { Metadata } from 'next';
import { AlertPreferencesForm } from '@/components/account/AlertPreferencesForm';
import { ChangePasswordForm } from '@/components/account/ChangePasswordForm';
import { PageHeader, Panel } from '@/components/ui/Page';
import { requireCapability } from '@/app/_lib/auth';
import { can, roleLabels } from '@/app/_lib/capabilities';
import { findAlertPreferences } from '@/db/queries/alerts';
import { changePassword, saveAlertPreferences } from './actions';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const user = await requireCapability('changeOwnPassword');
  return (
    <>
      <PageHeader title="Account" lead={`${user.name} · ${user.email} · ${roleLabels[user.role]}`} />
      <Panel title="Change password">
        <ChangePasswordForm action={changePassword} />
      </Panel>
      {can(user.role, 'receiveToleranceAlerts') ? (
        <Panel title="Alert e-mails" className="mt-6">
          <AlertPreferencesForm action={saveAlertPreferences} current={await findAlertPreferences(user.id)} />
        </Panel>
      ) : null}
    </>
  );
}
