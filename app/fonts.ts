// The shipped Lato subset (SIL OFL, public/fonts/LICENSE-Lato.txt); no font is fetched at build time.
import localFont from 'next/font/local';

export const lato = localFont({
  src: [
    { path: '../public/fonts/Lato-Regular.woff2', weight: '400', style: 'normal' },
    { path: '../public/fonts/Lato-Semibold.woff2', weight: '600', style: 'normal' },
    { path: '../public/fonts/Lato-Bold.woff2', weight: '700', style: 'normal' },
  ],
  variable: '--font-lato',
  display: 'swap',
});
