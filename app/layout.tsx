import type { Metadata, Viewport } from 'next';
import { lato } from './fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Hearthmark', template: '%s · Hearthmark' },
  description: 'Combustion safety inspections, certificates and invoices for appliance-testing companies.',
  applicationName: 'Hearthmark',
  manifest: '/manifest.webmanifest',
  icons: { icon: '/icons/icon-192.png', apple: '/icons/icon-192.png' },
};

export const viewport: Viewport = {
  themeColor: '#1b2030',
  width: 'device-width',
  initialScale: 1,
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB" className={lato.variable}>
      <body className="min-h-dvh bg-paper font-sans text-ink antialiased">{children}</body>
    </html>
  );
}
