type Tone = 'error' | 'success' | 'info';

export function FormMessage({ tone, children }: { tone: Tone; children: React.ReactNode }) {
  const styles = {
    error: 'border-alarm/30 bg-alarm-light text-alarm',
    success: 'border-fringe/30 bg-fringe-light text-fringe-dark',
    info: 'border-brass/30 bg-brass-light text-ink',
  }[tone];
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} data-tone={tone} className={`rounded-md border px-3 py-2 text-sm ${styles}`}>
      {children}
    </div>
  );
}
