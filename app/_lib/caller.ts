import 'server-only';
import { findLiveChamberToken, touchChamberToken, type TokenHolder } from '@/db/queries/chamberTokens';
import type { PublicUser } from '@/db/queries/users';
import { authorize } from './auth';
import type { Capability } from './capabilities';
import { CHAMBER_TOKEN_PREFIX, hashChamberToken } from './chamberTokens';
import { failure } from './errors';

/** Who is calling an API route: a signed-in user, or a chamber's controller PC with its token. */
export type Caller = { kind: 'user'; user: PublicUser } | { kind: 'chamber'; token: TokenHolder };

export type CallerResult = { ok: true; caller: Caller } | ReturnType<typeof failure>;

/**
 * Reads `Authorization: Bearer flk_…` (a chamber token) or else the session cookie. A user needs
 * the capability; a token may only do what `tokenMay` allows (upload to, and read runs of, its
 * own chamber; the route checks the chamber). The Authorization header is never logged.
 */
export async function authorizeCaller(request: Request, capability: Capability, tokenMay: boolean): Promise<CallerResult> {
  const header = request.headers.get('authorization');
  if (header !== null) {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
    const token = match?.[1];
    if (!token || !token.startsWith(CHAMBER_TOKEN_PREFIX)) return failure('unauthorized:token');
    const holder = await findLiveChamberToken(hashChamberToken(token));
    if (!holder) return failure('unauthorized:token');
    await touchChamberToken(holder.tokenId);
    if (!tokenMay) return failure('forbidden:role', 'A chamber token may only upload runs to its chamber and read them.');
    return { ok: true, caller: { kind: 'chamber', token: holder } };
  }
  const auth = await authorize(capability);
  if (!auth.ok) return auth;
  return { ok: true, caller: { kind: 'user', user: auth.user } };
}

/** The chamber a caller is confined to (a token's), or null for users. */
export function chamberScope(caller: Caller): number | null {
  return caller.kind === 'chamber' ? caller.token.chamberId : null;
}
