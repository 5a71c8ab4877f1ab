/**
 * Stands in for `after()` of next/server in integration tests: work scheduled after the answer
 * waits here until a test runs it, so a test can see what the answer did and did not do.
 */
const pending: (() => unknown)[] = [];

export function deferAfter(task: (() => unknown) | Promise<unknown>): void {
  pending.push(typeof task === 'function' ? task : () => task);
}

export function pendingAfterTasks(): number {
  return pending.length;
}

/** Runs what was scheduled after the answer, in order. */
export async function runAfterTasks(): Promise<void> {
  while (pending.length) await pending.shift()?.();
}
