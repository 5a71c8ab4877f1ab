import Link from 'next/link';

export default function RunNotFound() {
  return (
    <div className="flex max-w-lg flex-col gap-3 py-10">
      <h1 className="text-2xl font-semibold">No such run</h1>
      <p className="text-ink-soft">There is no run with this number. It may have been typed wrong.</p>
      <Link href="/runs" className="text-fringe underline-offset-2 hover:underline">
        Go to the list of runs
      </Link>
    </div>
  );
}
