import 'server-only';
import { randomBytes } from 'node:crypto';
import { chamberTokenHash } from '@/db/queries/chamberTokens';

export const CHAMBER_TOKEN_PREFIX = 'flk_';

/** A new chamber token: the prefix and 32 random bytes (base64url); only its SHA-256 is stored. */
export function newChamberToken(): { token: string; tokenHash: string; hint: string } {
  const token = CHAMBER_TOKEN_PREFIX + randomBytes(32).toString('base64url');
  return { token, tokenHash: hashChamberToken(token), hint: tokenHint(token) };
}

export const hashChamberToken = chamberTokenHash;

/** What the list shows of a token: the prefix and its last four characters. */
export function tokenHint(token: string): string {
  return `${CHAMBER_TOKEN_PREFIX}…${token.slice(-4)}`;
}
