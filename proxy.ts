import { NextResponse, type NextRequest } from 'next/server';
import { contentSecurityPolicy } from '@/app/_lib/csp';

/**
 * Server actions' body limit: Next's default `serverActions.bodySizeLimit` (1 MB). Next itself
 * answers a larger body with a 500; this answers 413 first. Keep the two in step.
 */
const ACTION_BODY_LIMIT_BYTES = 1024 * 1024;

/**
 * Every page request: a nonce Content-Security-Policy on the request (Next marks its scripts with
 * the nonce it finds there) and on the response; posts from another origin answer 403 and
 * oversized ones 413 before Next's action handler (which answers both with a 500). Not a gate
 * for sign-in: pages, actions and handlers check access themselves.
 */
export function proxy(request: NextRequest): NextResponse {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(18))).toString('base64');
  const csp = contentSecurityPolicy(nonce, process.env.NODE_ENV === 'development');
  const refused = refusal(request);
  if (refused) {
    refused.headers.set('content-security-policy', csp);
    return refused;
  }
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set('content-security-policy', csp);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set('content-security-policy', csp);
  return response;
}

function refusal(request: NextRequest): NextResponse | null {
  if (request.method === 'GET' || request.method === 'HEAD') return null;
  const origin = request.headers.get('origin');
  // Browsers send Origin on every cross-site POST; a request without one carries no cookies a browser would add.
  if (origin !== null) {
    const host = request.headers.get('x-forwarded-host') ?? request.headers.get('host');
    if (!host || hostOf(origin) !== host) return plain(403, 'Posts from other sites are refused.');
  }
  if (Number(request.headers.get('content-length') ?? 0) > ACTION_BODY_LIMIT_BYTES) return plain(413, 'The form sent more than 1 MB.');
  // A body without a stated length could only be measured by reading it; browsers always state it.
  if (request.headers.get('content-length') === null && /chunked/i.test(request.headers.get('transfer-encoding') ?? '')) {
    return plain(411, 'Send the form with a Content-Length.');
  }
  return null;
}

function hostOf(origin: string): string | null {
  try {
    return origin === 'null' ? null : new URL(origin).host;
  } catch {
    return null;
  }
}

function plain(status: number, message: string): NextResponse {
  return new NextResponse(message, { status, headers: { 'content-type': 'text/plain; charset=utf-8' } });
}

export const config = {
  // Route handlers stay out: the proxy would copy their bodies and cut them at 10 MB (uploads),
  // and they get their headers from next.config.mjs. Static files need no nonce.
  matcher: ['/((?!api/|_next/static/|_next/image|favicon.ico).*)'],
};
