import type { Metadata } from 'next';
import Link from 'next/link';
import { ResetRequestForm } from '@/components/auth/ResetRequestForm';
import { requestPasswordReset } from './actions';

export const metadata: Metadata = { title: 'Reset password' };

export default function ResetPasswordPage() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Reset your password</h1>
        <p className="mt-1 text-sm text-ink-soft">We e-mail you a link to choose a new one.</p>
      </div>
      <ResetRequestForm action={requestPasswordReset} />
      <Link href="/sign-in" className="text-sm text-fringe underline-offset-2 hover:underline">
        Back to sign-in
      </Link>
    </div>
  );
}
