/**
 * The Content-Security-Policy of every page, with a fresh nonce per response (set by proxy.ts on
 * the request, where Next reads it to mark its own scripts, and on the response).
 * - Scripts: only those carrying the nonce, and what they load ('strict-dynamic'); no eval
 *   outside development (React's dev build needs it).
 * - Styles: the app's own CSS files and nonce-marked style elements; style attributes are
 *   allowed (`style-src-attr`) because React's `style` props render as attributes.
 * - Fonts, images, fetches: this origin only (next/font/local ships the fonts from
 *   /_next/static; uPlot draws on a canvas and sets styles through the CSSOM).
 * - No plugins, no <base>, forms post only here, and no page may frame these.
 */
export function contentSecurityPolicy(nonce: string, dev = false): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    `style-src 'self' 'nonce-${nonce}'`,
    "style-src-attr 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}

/** Route handlers answer JSON or files, never a page: nothing may load or run in them. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'";
