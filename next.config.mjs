/**
 * Sent with every response, pages, route handlers, error pages and static files alike. The page
 * CSP carries a nonce per response and comes from proxy.ts; route handlers get a fixed one here.
 * HSTS only in production served over https (APP_URL), where browsers should never fall back.
 */
export function securityHeaders(env = process.env) {
  const fixed = [
    { key: 'X-Content-Type-Options', value: 'nosniff' },
    { key: 'X-Frame-Options', value: 'DENY' },
    // Links in mail carry one-time tokens: no other site gets to see our URLs.
    { key: 'Referrer-Policy', value: 'same-origin' },
    { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=(), usb=()' },
  ];
  if (env.NODE_ENV === 'production' && (env.APP_URL ?? '').startsWith('https://')) {
    fixed.push({ key: 'Strict-Transport-Security', value: 'max-age=63072000; includeSubDomains' });
  }
  return [
    { source: '/:path*', headers: fixed },
    // Same value as API_CSP in app/_lib/csp.ts.
    { source: '/api/:path*', headers: [{ key: 'Content-Security-Policy', value: "default-src 'none'; frame-ancestors 'none'" }] },
  ];
}

/** @type {import('next').NextConfig} */
const nextConfig = {
  // npm test builds into its own folder so it can run beside a running `npm start`.
  distDir: process.env.FRINGELOG_DIST_DIR || '.next',
  reactStrictMode: true,
  poweredByHeader: false,
  serverExternalPackages: ['pg', 'busboy', 'nodemailer', 'smtp-server', 'bcryptjs'],
  experimental: { authInterrupts: true },
  async headers() {
    return securityHeaders();
  },
  // `npm test` runs tsc over the whole repository; a type slip in a test must not stop `npm start`.
  typescript: { ignoreBuildErrors: true },
};

export default nextConfig;
