// Inter, shipped with the app from the @fontsource/inter package: nothing is fetched at build
// or run time.
import localFont from 'next/font/local';

export const inter = localFont({
  src: [
    { path: '../node_modules/@fontsource/inter/files/inter-latin-400-normal.woff2', weight: '400', style: 'normal' },
    { path: '../node_modules/@fontsource/inter/files/inter-latin-500-normal.woff2', weight: '500', style: 'normal' },
    { path: '../node_modules/@fontsource/inter/files/inter-latin-600-normal.woff2', weight: '600', style: 'normal' },
    { path: '../node_modules/@fontsource/inter/files/inter-latin-800-normal.woff2', weight: '800', style: 'normal' },
  ],
  variable: '--font-inter',
  display: 'swap',
});
