import Link from 'next/link';
import { Wordmark } from '@/components/brand/LogoMark';
import { AppNav } from '@/components/shell/AppNav';
import { requireUser } from '@/app/_lib/auth';
import { roleLabels } from '@/app/_lib/capabilities';
import { navigationFor } from '@/app/_lib/navigation';
import { signOut } from './actions';

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  return (
    <div className="flex min-h-screen flex-col">
      <header className="bg-ink text-paper print:hidden">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-8 gap-y-3 px-6 py-3">
          <Link href="/" className="text-paper-raised">
            <Wordmark onDark />
          </Link>
          <AppNav items={navigationFor(user.role)} />
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="text-right leading-tight">
              <span className="block font-medium" data-testid="user-name">
                {user.name}
              </span>
              <span className="block text-xs text-paper-sunk/70" data-testid="user-role">
                {roleLabels[user.role]}
              </span>
            </span>
            <form action={signOut}>
              <button type="submit" className="rounded-md border border-white/20 px-3 py-1.5 text-sm hover:bg-white/10">
                Sign out
              </button>
            </form>
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-6 py-8 print:max-w-none print:p-0">{children}</main>
      <footer className="border-t border-paper-line print:hidden">
        <div className="mx-auto max-w-6xl px-6 py-3 font-mono text-xs text-ink-faint">Fringelog · Larkspur Optical Works</div>
      </footer>
    </div>
  );
}
