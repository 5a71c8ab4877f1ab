/** @type {import('next').NextConfig} */
const nextConfig = {
  // npm test builds into its own folder so it can run beside a running `npm start`.
  distDir: process.env.FRINGELOG_DIST_DIR || '.next',
  reactStrictMode: true,
  poweredByHeader: false,
  serverExternalPackages: ['pg', 'busboy', 'nodemailer', 'smtp-server', 'bcryptjs'],
  experimental: { authInterrupts: true },
  // `npm test` runs tsc over the whole repository; a type slip in a test must not stop `npm start`.
  typescript: { ignoreBuildErrors: true },
};

export default nextConfig;
