import type { Metadata } from 'next';
import { cookies } from 'next/headers';
import { mono, sans } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  // each page names its record first: "VX-B · Visor VX birdbath — Veilmeter"
  title: { default: 'Veilmeter', template: '%s — Veilmeter' },
  description: 'Contrast, ghost and see-through measurements for see-through displays',
  // public/: icon.svg and the PNGs scripts/make-icons.mjs renders from it
  manifest: '/manifest.webmanifest',
  icons: {
    icon: [
      { url: '/icon.svg', type: 'image/svg+xml' },
      { url: '/icon-32.png', type: 'image/png', sizes: '32x32' },
    ],
    apple: { url: '/apple-touch-icon.png', sizes: '180x180' },
  },
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const theme = (await cookies()).get('vm-theme')?.value === 'light' ? 'light' : 'dark';
  return (
    <html lang="en" data-theme={theme} className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen font-sans antialiased">{children}</body>
    </html>
  );
}
