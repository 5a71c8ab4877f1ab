import type { Metadata } from 'next';
import { CreateChamberTokenForm, RevokeChamberToken } from '@/components/admin/ChamberTokenControls';
import { Badge, PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { listChamberTokens } from '@/db/queries/chamberTokens';
import { listChambers } from '@/db/queries/chambers';
import { env } from '@/db/env';
import { requireCapability } from '@/app/_lib/auth';
import { createChamberTokenAction, revokeChamberTokenAction } from './actions';
import { DataTable, type Column } from '@/components/ui/DataTable';

const columns: Column[] = [
  { key: 'token', label: 'Token' },
  { key: 'chamber', label: 'Chamber' },
  { key: 'usedBy', label: 'Used by' },
  { key: 'created', label: 'Created' },
  { key: 'lastUsed', label: 'Last used' },
  { key: 'actions', label: <span className="sr-only">Actions</span> },
];

export const metadata: Metadata = { title: 'Chamber tokens' };

export default async function ChamberTokensPage() {
  await requireCapability('manageChamberTokens');
  const [tokens, chambers] = await Promise.all([listChamberTokens(), listChambers()]);
  return (
    <>
      <PageHeader
        title="Chamber tokens"
        lead="A chamber token lets a coater's controller PC upload its finished runs to that chamber, and read them back, without a person signing in. It can do nothing else."
      />
      <Panel title="New token" className="mb-6">
        <CreateChamberTokenForm action={createChamberTokenAction} chambers={chambers.map((c) => ({ id: c.id, name: c.name }))} appUrl={env().APP_URL} />
      </Panel>
      <Panel title="Tokens">
        {tokens.length === 0 ? (
          <p className="text-sm text-ink-soft">No chamber tokens yet.</p>
        ) : (
          <DataTable columns={columns} testId="tokens-table">
            {tokens.map((t) => (
              <tr key={t.id} data-token-hint={t.hint} className={t.revokedAt ? 'text-ink-faint' : undefined}>
                <td className="py-2 pr-4 font-mono text-xs whitespace-nowrap">{t.hint}</td>
                <td className="py-2 pr-4 whitespace-nowrap">{t.chamberName}</td>
                <td className="py-2 pr-4">{t.label}</td>
                <td className="py-2 pr-4 text-xs whitespace-nowrap">
                  {formatTime(t.createdAt)}
                  {t.createdByName ? <span className="block text-ink-faint">by {t.createdByName}</span> : null}
                </td>
                <td className="py-2 pr-4 text-xs whitespace-nowrap" data-testid="token-last-used">
                  {t.lastUsedAt ? formatTime(t.lastUsedAt) : 'never'}
                </td>
                <td className="py-2 text-right">
                  {t.revokedAt ? <Badge tone="plain">revoked {formatTime(t.revokedAt).slice(0, 10)}</Badge> : <RevokeChamberToken action={revokeChamberTokenAction} tokenId={t.id} hint={t.hint} label={t.label} />}
                </td>
              </tr>
            ))}
          </DataTable>
        )}
      </Panel>
    </>
  );
}
