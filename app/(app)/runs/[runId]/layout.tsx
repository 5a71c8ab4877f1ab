import { notFound } from 'next/navigation';
import { requireCapability } from '@/app/_lib/auth';
import { runExists } from '@/db/queries/runs';
import { parseRunId } from './runView';

/**
 * Checks the run exists before the page's loading boundary starts streaming, so an unknown run
 * answers with a real 404 (a notFound() inside the streamed page would arrive after a 200).
 */
export default async function RunLayout({ children, params }: { children: React.ReactNode; params: Promise<{ runId: string }> }) {
  await requireCapability('viewRuns');
  const id = parseRunId((await params).runId);
  if (id === null || !(await runExists(id))) notFound();
  return children;
}
