import Link from 'next/link';
import { LogoMark } from '@/components/brand/LogoMark';

export default function Forbidden() {
  return (
    <div className="mx-auto flex min-h-[60vh] max-w-lg flex-col justify-center gap-4 p-6">
      <LogoMark size={40} />
      <h1 className="text-2xl font-semibold">Not for your role</h1>
      <p className="text-ink-soft">Your role does not give access to this page. If you need it, ask an administrator.</p>
      <Link href="/" className="text-fringe underline-offset-2 hover:underline">
        Go to the overview
      </Link>
    </div>
  );
}
