import type { Metadata } from 'next';
import { Fragment } from 'react';
import { PageHeader, Panel, formatTime } from '@/components/ui/Page';
import { listCaughtMail } from '@/db/queries/mail';
import { requireCapability } from '@/app/_lib/auth';

export const metadata: Metadata = { title: 'Mail' };

/** Shows links in a plain-text body as links, so an invite can be followed from here. */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/\S+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all text-fringe underline">
            {p}
          </a>
        ) : (
          <Fragment key={i}>{p}</Fragment>
        ),
      )}
    </>
  );
}

export default async function MailPage() {
  await requireCapability('viewMailSink');
  const messages = await listCaughtMail();
  return (
    <>
      <PageHeader title="Mail" lead="Messages the local mail sink caught. In production, SMTP_URL points at a real mail server and nothing lands here." />
      {messages.length === 0 ? (
        <Panel>
          <p className="text-ink-soft">No messages yet. Invitations and password resets will show up here.</p>
        </Panel>
      ) : (
        <div className="flex flex-col gap-4">
          {messages.map((m) => (
            <Panel key={m.id}>
              <article data-mail-id={m.id}>
                <header className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
                  <h2 className="font-semibold">{m.subject || '(no subject)'}</h2>
                  <span className="font-mono text-xs text-ink-faint">{formatTime(m.receivedAt)}</span>
                </header>
                <p className="mb-3 font-mono text-xs text-ink-soft">
                  to {m.envelopeTo.join(', ')} · from {m.envelopeFrom}
                </p>
                <pre className="whitespace-pre-wrap rounded-md bg-paper-sunk p-3 font-mono text-sm">
                  <Linked text={m.textBody} />
                </pre>
              </article>
            </Panel>
          ))}
        </div>
      )}
    </>
  );
}
