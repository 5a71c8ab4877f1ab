import type { Metadata } from 'next';
import { plexMono, plexSans } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Fringelog', template: '%s · Fringelog' },
  description: 'Layer-by-layer analysis of optical-monitor traces for coating chambers.',
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${plexSans.variable} ${plexMono.variable}`}>
      <body>{children}</body>
    </html>
  );
}
