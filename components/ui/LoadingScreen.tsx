import { LogoMark } from '@/components/brand/LogoMark';

/** The route-level loading state of the signed-in pages. */
export function LoadingScreen() {
  return (
    <div className="flex min-h-[50vh] items-center justify-center gap-3 text-ink-soft" role="status">
      <LogoMark size={24} className="animate-pulse" />
      <span>Loading…</span>
    </div>
  );
}
