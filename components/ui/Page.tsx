export function PageHeader({ title, lead, children }: { title: string; lead?: string; children?: React.ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-paper-line pb-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {lead ? <p className="mt-1 max-w-2xl text-ink-soft">{lead}</p> : null}
      </div>
      {children}
    </header>
  );
}

export function Panel({ title, children, className }: { title?: string; children: React.ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-paper-line bg-paper-raised p-5 shadow-sm ${className ?? ''}`}>
      {title ? <h2 className="mb-3 text-sm font-semibold uppercase tracking-wider text-ink-faint">{title}</h2> : null}
      {children}
    </section>
  );
}

export function Badge({ children, tone = 'fringe' }: { children: React.ReactNode; tone?: 'fringe' | 'film' | 'brass' | 'alarm' | 'plain' }) {
  const styles = {
    fringe: 'bg-fringe-light text-fringe-dark',
    film: 'bg-film-light text-film',
    brass: 'bg-brass-light text-ink',
    alarm: 'bg-alarm-light text-alarm',
    plain: 'bg-paper-sunk text-ink-soft',
  }[tone];
  return <span className={`inline-block rounded px-2 py-0.5 text-xs font-medium ${styles}`}>{children}</span>;
}

export function formatTime(d: Date): string {
  return d.toISOString().replace('T', ' ').slice(0, 16) + ' UTC';
}
