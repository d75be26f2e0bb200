import type { Metadata } from 'next';
import type { ReactNode } from 'react';
import { inter } from './fonts';
import { SiteHeader } from '@/components/shell/SiteHeader';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Whorlwind', template: '%s · Whorlwind' },
  description: 'Lay out the flow of a coat — whorls, partings, crests — and hand the pipeline guide curves.',
  // The mark of components/shell/WhorlMark.tsx, rendered to a file.
  icons: { icon: '/whorlwind-mark.svg' },
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body className="flex min-h-screen flex-col">
        <SiteHeader />
        <main className="mx-auto w-full max-w-6xl flex-1 px-6 py-10">{children}</main>
        <footer className="border-t-2 border-vellum">
          <div className="mx-auto max-w-6xl px-6 py-5 text-sm text-loam-soft">
            Whorlwind — direction fields and guide curves for character groomers.
          </div>
        </footer>
      </body>
    </html>
  );
}
