import type { Metadata } from 'next';
import { CreateChamberTokenForm, RevokeChamberToken } from '@/components/admin/ChamberTokenControls';
import { Badge, PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { listChamberTokens } from '@/db/queries/chamberTokens';
import { listChambers } from '@/db/queries/chambers';
import { env } from '@/db/env';
import { requireCapability } from '@/app/_lib/auth';
import { createChamberTokenAction, revokeChamberTokenAction } from './actions';

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
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="tokens-table">
              <thead className="text-xs uppercase tracking-wider text-ink-faint">
                <tr>
                  <th className="pb-2 pr-4 font-medium">Token</th>
                  <th className="pb-2 pr-4 font-medium">Chamber</th>
                  <th className="pb-2 pr-4 font-medium">Used by</th>
                  <th className="pb-2 pr-4 font-medium">Created</th>
                  <th className="pb-2 pr-4 font-medium">Last used</th>
                  <th className="pb-2 font-medium" />
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-line">
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
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </>
  );
}
