import 'server-only';
import type PgBoss from 'pg-boss';
import { isShiftName, lastEndedShift, SHIFTS, SHIFT_TIME_ZONE, shiftEndCron, type ShiftName, type ShiftWindow } from './shifts';

export const SHIFT_DIGEST_QUEUE_PREFIX = 'shift-digest';

/** A digest that fails (mail server away) is tried again a few times; one takes seconds. */
export const SHIFT_DIGEST_QUEUE_POLICY = { retryLimit: 3, retryDelay: 60, retryBackoff: true, expireInSeconds: 10 * 60 } as const;

export type ShiftDigestJob = { shift: ShiftName };

/** pg-boss keeps one schedule per queue, so each shift has its own queue. */
export function shiftDigestQueue(shift: ShiftName, prefix = SHIFT_DIGEST_QUEUE_PREFIX): string {
  return `${prefix}-${shift}`;
}

/**
 * Registers the digest of each shift with pg-boss's scheduler (a cron at the shift's end) and
 * works its queue with `send`, given the window of the shift that just ended. Every worker does
 * this: queue creation and `schedule` are upserts by name, and pg-boss sends each cron tick once
 * however many workers run it. The window is taken from the job's creation time, so a job that
 * waits (all workers down) still reports the shift it was made for.
 */
export async function registerShiftDigests(boss: PgBoss, send: (window: ShiftWindow) => Promise<unknown>, prefix = SHIFT_DIGEST_QUEUE_PREFIX): Promise<string[]> {
  const queues: string[] = [];
  for (const { name } of SHIFTS) {
    const queue = shiftDigestQueue(name, prefix);
    await boss.createQueue(queue, { name: queue, ...SHIFT_DIGEST_QUEUE_POLICY });
    const data: ShiftDigestJob = { shift: name };
    await boss.schedule(queue, shiftEndCron(name), data, { tz: SHIFT_TIME_ZONE });
    await boss.work<ShiftDigestJob>(queue, { batchSize: 1, includeMetadata: true }, async ([job]) => {
      if (!isShiftName(job.data?.shift)) throw new Error(`shift digest job ${job.id} on ${queue}: data.shift must be one of ${SHIFTS.map((s) => s.name).join(', ')}`);
      await send(lastEndedShift(job.data.shift, job.createdOn));
    });
    queues.push(queue);
  }
  return queues;
}
