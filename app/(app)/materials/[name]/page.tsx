import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { AdoptIndexForm } from '@/components/materials/AdoptIndexForm';
import { MaterialCurve } from '@/components/materials/MaterialCurve';
import { FormMessage } from '@/components/forms';
import { fixed } from '@/components/runs/format';
import { Badge, PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { fittedIndexOf } from '@/db/queries/materials';
import { requireCapability } from '@/app/_lib/auth';
import { can } from '@/app/_lib/capabilities';
import { findMaterialView, kindLabels, modelSummary, nAt, nameParam } from '@/app/_lib/materialView';
import { adoptIndex } from '../actions';

export const metadata: Metadata = { title: 'Material' };

export default async function MaterialPage({ params }: { params: Promise<{ name: string }> }) {
  const user = await requireCapability('viewDesigns');
  const name = nameParam((await params).name);
  const view = await findMaterialView(name);
  if (!view) notFound();
  const fitted = await fittedIndexOf(name);
  const editor = can(user.role, 'editDesigns') && !view.builtIn;
  const description = view.builtIn ? view.entry.description : view.row.description;
  const source = view.builtIn ? view.entry.source : view.row.source;
  return (
    <>
      <PageHeader title={name} lead={description || undefined}>
        <div className="flex items-center gap-2">
          {view.builtIn ? <Badge tone="plain">built in, read-only · {kindLabels[view.entry.kind]}</Badge> : <Badge>shop material</Badge>}
          {editor ? (
            <Link className="rounded-md border border-paper-line bg-paper-raised px-3 py-1.5 text-sm font-medium hover:bg-paper-sunk" href={`/materials/${encodeURIComponent(name)}/edit`}>
              Edit
            </Link>
          ) : null}
        </div>
      </PageHeader>
      <div className="flex flex-col gap-6">
        <Panel title="Model">
          {view.model ? (
            <>
              <p className="mb-1 font-mono text-sm" data-testid="material-model">
                {modelSummary(view.model)}
              </p>
              <p className="mb-4 text-xs text-ink-soft">Source: {source || 'not given'}</p>
              <MaterialCurve model={view.model} name={name} />
            </>
          ) : (
            <FormMessage tone="error">The stored model no longer validates; edit it.</FormMessage>
          )}
          {!view.builtIn ? <p className="mt-3 text-xs text-ink-faint">Last changed {formatTime(view.row.updatedAt)}.</p> : null}
        </Panel>
        <Panel title="Index fitted from the shop's runs">
          {fitted.length === 0 ? (
            <p className="text-sm text-ink-soft" data-testid="fitted-none">
              No stored analysis has a layer of {name} yet.
            </p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm" data-testid="fitted-index">
                <thead className="text-xs text-ink-faint">
                  <tr>
                    <th className="pb-2 pr-4 font-medium">Monitor λ nm</th>
                    <th className="pb-2 pr-4 text-right font-medium">Runs · layers</th>
                    <th className="pb-2 pr-4 text-right font-medium">Fitted n (mean ± sd)</th>
                    <th className="pb-2 pr-4 text-right font-medium">Typical σ of one fit</th>
                    <th className="pb-2 pr-4 text-right font-medium">Nominal n</th>
                    <th className="pb-2 pr-4 text-right font-medium">Difference</th>
                    {editor ? <th className="pb-2 font-medium" /> : null}
                  </tr>
                </thead>
                <tbody className="divide-y divide-paper-line">
                  {fitted.map((f) => {
                    const nominal = nAt(view.model, f.wavelengthNm);
                    return (
                      <tr key={f.wavelengthNm} data-fitted-wavelength={f.wavelengthNm} className="align-top">
                        <td className="py-2 pr-4 font-mono">{f.wavelengthNm}</td>
                        <td className="py-2 pr-4 text-right font-mono">
                          {f.runs} · {f.layers}
                        </td>
                        <td className="py-2 pr-4 text-right font-mono">
                          {fixed(f.mean, 4)}
                          {f.sd !== null ? ` ± ${fixed(f.sd, 4)}` : ''}
                        </td>
                        <td className="py-2 pr-4 text-right font-mono">{fixed(f.meanSigma, 4)}</td>
                        <td className="py-2 pr-4 text-right font-mono">{fixed(nominal, 4)}</td>
                        <td className="py-2 pr-4 text-right font-mono">{nominal === null ? '–' : fixed(f.mean - nominal, 4)}</td>
                        {editor ? (
                          <td className="py-2">
                            <AdoptIndexForm action={adoptIndex} name={name} wavelengthNm={f.wavelengthNm} index={f.mean.toFixed(4)} />
                          </td>
                        ) : null}
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          )}
          <p className="mt-3 text-xs text-ink-faint">
            From the newest finished analysis of each run (the joint re-fit where there is one), at each layer&apos;s monitor wavelength. Adopting moves
            the model so n there equals the runs&apos; mean, keeping its dispersion; the change is audited. Advisory: follow your shop&apos;s procedure
            before changing a nominal.
          </p>
        </Panel>
      </div>
    </>
  );
}
