import 'server-only';
import { createHash, randomBytes } from 'node:crypto';
import type { TokenProblem } from '@/db/queries/tokens';

export const INVITE_TTL_MS = 72 * 60 * 60 * 1000;
export const RESET_TTL_MS = 60 * 60 * 1000;
export const RESET_SPACING_MS = 60 * 1000;

export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export function tokenProblemMessage(problem: TokenProblem): string {
  switch (problem) {
    case 'used':
      return 'This link has already been used. Ask for a new one.';
    case 'expired':
      return 'This link has expired. Ask for a new one.';
    case 'inactive':
      return 'This account is deactivated. Ask an administrator.';
    default:
      return 'This link is not valid. Open the link from the e-mail again, or ask for a new one.';
  }
}
