import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { SignInForm } from '@/components/auth/SignInForm';
import { FormMessage } from '@/components/forms';
import { currentUser } from '@/app/_lib/auth';
import { lookUp, oneParam } from '@/app/_lib/params';
import { signIn } from './actions';

export const metadata: Metadata = { title: 'Sign in' };

const notices: Record<string, string> = {
  'password-set': 'Your password is saved. Sign in with it now.',
  'signed-out': 'You are signed out.',
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ notice?: string | string[] }> }) {
  if (await currentUser()) redirect('/');
  // Own keys only: `?notice=constructor` must not find Object.prototype's.
  const notice = lookUp(notices, oneParam((await searchParams).notice));
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Sign in</h1>
        <p className="mt-1 text-sm text-ink-soft">With the e-mail address your administrator invited.</p>
      </div>
      {notice ? <FormMessage tone="success">{notice}</FormMessage> : null}
      <SignInForm action={signIn} />
    </div>
  );
}
