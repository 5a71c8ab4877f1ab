import Link from 'next/link';
import { LogoMark } from '@/components/brand/LogoMark';

export default function NotFound() {
  return (
    <div className="mx-auto flex min-h-[60vh] max-w-lg flex-col justify-center gap-4 p-6">
      <LogoMark size={40} />
      <h1 className="text-2xl font-semibold">Nothing here</h1>
      <p className="text-ink-soft">This address does not lead to a page of Fringelog.</p>
      <Link href="/" className="text-fringe underline-offset-2 hover:underline">
        Go to the overview
      </Link>
    </div>
  );
}
