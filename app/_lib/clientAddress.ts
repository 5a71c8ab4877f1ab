import 'server-only';
import { headers } from 'next/headers';

/**
 * The address a request came from, for the per-client sign-in limit.
 *
 * Next.js gives route code no socket, only headers: `next start` copies the socket's address into
 * X-Forwarded-For when the request has none, and keeps a header the request brought. Fringelog
 * listens on 127.0.0.1 and is meant to sit behind a reverse proxy that appends the address it
 * saw to X-Forwarded-For (nginx: `$proxy_add_x_forwarded_for`), so the last entry is the one a
 * hop we run wrote; earlier entries are whatever the client claimed. Without such a proxy a
 * local client could name any address; the per-e-mail limit holds either way.
 */
export async function clientAddress(): Promise<string> {
  const forwarded = (await headers()).get('x-forwarded-for') ?? '';
  const last = forwarded.split(',').pop()?.trim() ?? '';
  // Bounded: the key goes into the database and the lock name.
  return last ? last.slice(0, 64).toLowerCase() : 'unknown';
}
