import type { Metadata } from 'next';
import { connection } from 'next/server';
import { plexMono, plexSans } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Fringelog', template: '%s · Fringelog' },
  description: 'Layer-by-layer analysis of optical-monitor traces for coating chambers.',
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page renders per request: a prerendered page would carry no CSP nonce and never hydrate.
  await connection();
  return (
    <html lang="en" className={`${plexSans.variable} ${plexMono.variable}`}>
      <body>{children}</body>
    </html>
  );
}
