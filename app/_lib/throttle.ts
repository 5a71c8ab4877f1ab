import 'server-only';
import { markAttemptSucceeded, reserveAttempt } from '@/db/queries/signInAttempts';
import { clientAddress } from './clientAddress';

export const MAX_FAILURES = 5;
/** Common practice for a shop behind one address: room for everyone's typos, not for a password spray. */
export const MAX_CLIENT_FAILURES = 20;
export const LOCK_WINDOW_MS = 15 * 60 * 1000;

export type Guess = { allowed: true; triesLeft: number; succeeded(): Promise<void> } | { allowed: false; message: string };

/**
 * Takes one guess at a password for this e-mail address (sign-in, or the current password on
 * the account page). After MAX_FAILURES failed guesses in a row within LOCK_WINDOW_MS, further
 * guesses for that address wait until LOCK_WINDOW_MS after the latest failure; the same after
 * MAX_CLIENT_FAILURES failures from one client address. The check and the record are one step,
 * so simultaneous guesses cannot slip past the limit. Call `succeeded()` when the password was right.
 */
export async function takeGuess(email: string): Promise<Guess> {
  const reservation = await reserveAttempt(email, await clientAddress(), {
    perEmail: MAX_FAILURES,
    perClient: MAX_CLIENT_FAILURES,
    windowMs: LOCK_WINDOW_MS,
  });
  if (!reservation.ok) {
    return { allowed: false, message: reservation.scope === 'email' ? lockMessage(reservation.retryAfterMs) : clientLockMessage(reservation.retryAfterMs) };
  }
  return { allowed: true, triesLeft: reservation.triesLeft, succeeded: () => markAttemptSucceeded(reservation.attemptId) };
}

function minutes(ms: number): string {
  const n = Math.min(LOCK_WINDOW_MS / 60000, Math.max(1, Math.ceil(ms / 60000)));
  return `${n} minute${n === 1 ? '' : 's'}`;
}

export function lockMessage(retryAfterMs: number): string {
  return `Too many failed sign-ins for this e-mail address. Wait ${minutes(retryAfterMs)} and try again, or reset your password.`;
}

export function clientLockMessage(retryAfterMs: number): string {
  return `Too many failed sign-ins from your network address. Wait ${minutes(retryAfterMs)} and try again.`;
}

/** What a wrong password is told: the tries left, or that this one started the pause. */
export function wrongGuessMessage(lead: string, triesLeft: number): string {
  if (triesLeft > 0) return `${lead} ${triesLeft} ${triesLeft === 1 ? 'try' : 'tries'} left before a 15-minute pause.`;
  return `${lead} Sign-in for this address is now paused for 15 minutes; you can also reset your password.`;
}
