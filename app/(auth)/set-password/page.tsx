import type { Metadata } from 'next';
import Link from 'next/link';
import { SetPasswordForm } from '@/components/auth/SetPasswordForm';
import { FormMessage } from '@/components/forms';
import { checkToken } from '@/db/queries/tokens';
import { oneParam } from '@/app/_lib/params';
import { hashToken, tokenProblemMessage } from '@/app/_lib/tokens';
import { setPasswordWithToken } from './actions';

export const metadata: Metadata = { title: 'Choose a password' };

export default async function SetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  // A link carries one token; a repeated one is a mangled link, not two tokens to try.
  const token = oneParam((await searchParams).token);
  const check = token ? await checkToken(hashToken(token)) : ({ ok: false, problem: 'unknown' } as const);
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{check.ok && check.kind === 'invite' ? 'Welcome to Fringelog' : 'Choose a new password'}</h1>
        {check.ok ? <p className="mt-1 text-sm text-ink-soft">For {check.email}</p> : null}
      </div>
      {check.ok && token ? (
        <SetPasswordForm action={setPasswordWithToken} token={token} email={check.email} />
      ) : (
        <>
          <FormMessage tone="error">{tokenProblemMessage(check.ok ? 'unknown' : check.problem)}</FormMessage>
          <Link href="/reset-password" className="text-sm text-fringe underline-offset-2 hover:underline">
            Ask for a new link
          </Link>
        </>
      )}
    </div>
  );
}
