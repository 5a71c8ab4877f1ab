import { describe, expect, it } from 'vitest';
import { API_CSP, contentSecurityPolicy } from '../csp';

type Rule = { source: string; headers: { key: string; value: string }[] };
// next.config.mjs is plain JavaScript; a computed specifier keeps tsc from looking for its types.
const configPath = '../../../next.config.mjs';
const { securityHeaders, default: config } = (await import(configPath)) as {
  securityHeaders: (env: Record<string, string | undefined>) => Rule[];
  default: { headers(): Promise<Rule[]>; poweredByHeader: boolean };
};

const keysFor = (rules: Rule[], source: string) => rules.find((r) => r.source === source)?.headers.map((h) => h.key) ?? [];

describe('fixed security headers (next.config.mjs)', () => {
  it('go on every path, with HSTS only in production over https', () => {
    const base = ['X-Content-Type-Options', 'X-Frame-Options', 'Referrer-Policy', 'Permissions-Policy'];
    expect(keysFor(securityHeaders({ NODE_ENV: 'production', APP_URL: 'https://fringelog.larkspur.example' }), '/:path*')).toEqual([...base, 'Strict-Transport-Security']);
    expect(keysFor(securityHeaders({ NODE_ENV: 'production', APP_URL: 'http://localhost:3000' }), '/:path*')).toEqual(base);
    expect(keysFor(securityHeaders({ NODE_ENV: 'development', APP_URL: 'https://fringelog.larkspur.example' }), '/:path*')).toEqual(base);
  });

  it('give route handlers the fixed API policy, and the config uses them', async () => {
    const api = securityHeaders({}).find((r) => r.source === '/api/:path*');
    expect(api?.headers).toEqual([{ key: 'Content-Security-Policy', value: API_CSP }]);
    expect((await config.headers()).map((r) => r.source)).toEqual(['/:path*', '/api/:path*']);
    expect(config.poweredByHeader).toBe(false);
  });
});

describe('the page CSP', () => {
  it('lets scripts run only with the nonce, allows style attributes, and refuses framing', () => {
    const csp = contentSecurityPolicy('bm9uY2U=');
    const directives = Object.fromEntries(csp.split('; ').map((d) => [d.split(' ')[0], d.split(' ').slice(1)]));
    expect(directives['script-src']).toEqual(["'self'", "'nonce-bm9uY2U='", "'strict-dynamic'"]);
    expect(directives['style-src-attr']).toEqual(["'unsafe-inline'"]);
    expect(directives['frame-ancestors']).toEqual(["'none'"]);
    expect(directives['object-src']).toEqual(["'none'"]);
    expect(csp).not.toMatch(/unsafe-eval|\*/);
    expect(contentSecurityPolicy('x', true)).toMatch(/script-src [^;]*'unsafe-eval'/);
  });
});
