import type { Metadata } from 'next';
import Link from 'next/link';
import { Badge, PageHeader, Panel } from '@/components/ui/Page';
import { listChambers } from '@/db/queries/chambers';
import { requireUser } from '@/app/_lib/auth';
import { capabilities, roleLabels, type Capability } from '@/app/_lib/capabilities';

export const metadata: Metadata = { title: 'Overview' };

const capabilityText: Record<Capability, { text: string; href?: string }> = {
  viewRuns: { text: 'Read the runs of every chamber and their layer-by-layer analyses', href: '/runs' },
  manageUsers: { text: 'Invite people, set their roles and deactivate accounts', href: '/admin/users' },
  viewAuditLog: { text: 'Read the audit log of who changed what', href: '/audit' },
  viewMailSink: { text: 'Read the mail the local sink caught', href: '/admin/mail' },
  changeOwnPassword: { text: 'Change your own password', href: '/account' },
  viewSystemHealth: { text: 'Read the database’s version and migrations at /api/health' },
  compareRuns: { text: 'Compare runs across shifts and chambers, with control charts', href: '/compare' },
  receiveToleranceAlerts: { text: 'Get e-mail when a layer is out of tolerance (choose on your account page)', href: '/account' },
  writeRunNotes: { text: 'Pin notes to a moment or a layer of a run, and join its discussion' },
  setRunDisposition: { text: 'Decide whether a run is good to ship, held for review or not to ship, with the reason' },
  viewDesigns: { text: 'Read the designs, their spectra, cut plans and monitor curves, and the materials', href: '/designs' },
  editDesigns: { text: 'Edit and import designs (each save a new revision) and the shop materials', href: '/materials' },
  uploadRuns: { text: 'Upload the trace of a finished run for analysis', href: '/runs/upload' },
  reanalyseRuns: { text: 'Analyse a run again with other fit settings' },
  manageChamberTokens: { text: "Issue and revoke the chamber tokens that let a coater's PC upload its runs", href: '/admin/chamber-tokens' },
};

export default async function HomePage() {
  const user = await requireUser();
  const chambers = await listChambers();
  const mine = (Object.keys(capabilityText) as Capability[]).filter((c) => capabilities[user.role][c]);
  return (
    <>
      <PageHeader title={`Good to see you, ${user.name.split(' ')[0]}`} lead="Fringelog reads optical-monitor traces back into layers: thickness, index, rate and cut error against the design." />
      <div className="grid gap-6 md:grid-cols-[2fr_1fr]">
        <Panel title="Chambers">
          <ul className="divide-y divide-paper-line">
            {chambers.map((c) => (
              <li key={c.id} className="flex flex-col gap-1 py-3 first:pt-0 last:pb-0">
                <div className="flex items-center gap-2">
                  <span className="font-medium">{c.name}</span>
                  <Badge tone="plain">{c.process}</Badge>
                </div>
                <p className="text-sm text-ink-soft">{c.description}</p>
              </li>
            ))}
            {chambers.length === 0 ? <li className="text-sm text-ink-faint">No chambers recorded yet.</li> : null}
          </ul>
        </Panel>
        <Panel title="Your role">
          <p className="mb-3">
            <Badge tone="film">{roleLabels[user.role]}</Badge>
          </p>
          <ul className="flex list-disc flex-col gap-1 pl-5 text-sm text-ink-soft">
            {mine.map((c) => (
              <li key={c}>
                {capabilityText[c].href ? (
                  <Link className="text-fringe underline-offset-2 hover:underline" href={capabilityText[c].href}>
                    {capabilityText[c].text}
                  </Link>
                ) : (
                  capabilityText[c].text
                )}
              </li>
            ))}
          </ul>
        </Panel>
      </div>
    </>
  );
}
