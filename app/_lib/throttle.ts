import 'server-only';
import { recentFailures } from '@/db/queries/signInAttempts';

export const MAX_FAILURES = 5;
export const LOCK_WINDOW_MS = 15 * 60 * 1000;

export type Throttle = { locked: false; triesLeft: number } | { locked: true; retryAfterMs: number };

/**
 * After MAX_FAILURES failed sign-ins in a row within LOCK_WINDOW_MS, further tries for that
 * e-mail wait until LOCK_WINDOW_MS has passed since the latest failure.
 */
export async function signInThrottle(email: string, now = new Date()): Promise<Throttle> {
  const failures = await recentFailures(email, new Date(now.getTime() - LOCK_WINDOW_MS));
  if (failures.length < MAX_FAILURES) return { locked: false, triesLeft: MAX_FAILURES - failures.length };
  return { locked: true, retryAfterMs: failures[0].getTime() + LOCK_WINDOW_MS - now.getTime() };
}

export function lockMessage(retryAfterMs: number): string {
  const minutes = Math.max(1, Math.ceil(retryAfterMs / 60000));
  return `Too many failed sign-ins for this e-mail address. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or reset your password.`;
}
