import 'server-only';
// Registers the shipped Lato TTF files with @react-pdf once per process; every document (invoices,
// certificates) calls registerPdfFonts() before rendering and uses PDF_FONT.
import path from 'node:path';
import { Font } from '@react-pdf/renderer';

export const PDF_FONT = 'Lato';

let registered = false;

export function registerPdfFonts(): void {
  if (registered) return;
  const dir = path.join(process.cwd(), 'public', 'fonts');
  Font.register({
    family: PDF_FONT,
    fonts: [
      { src: path.join(dir, 'Lato-Regular.ttf'), fontWeight: 400 },
      { src: path.join(dir, 'Lato-Semibold.ttf'), fontWeight: 600 },
      { src: path.join(dir, 'Lato-Bold.ttf'), fontWeight: 700 },
    ],
  });
  // Addresses, serial numbers and references must never be split with a hyphen.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}
