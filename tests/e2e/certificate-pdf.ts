// Helpers the certificate tests use on a downloaded PDF: its text, page images for a person to look
// at, and the QR code's modules compared with the code the printed check URL encodes to.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import QRCode from 'qrcode';
import sharp from 'sharp';
import { extractText, getDocumentProxy } from 'unpdf';

export async function pdfText(pdf: Buffer): Promise<string> {
  const { text } = await extractText(await getDocumentProxy(new Uint8Array(pdf)), { mergePages: true });
  return text.replace(/\s+/g, ' ');
}

/** Writes the PDF and one PNG per page (pdftoppm at 80 dpi) under `dir`; returns the PNG paths. */
export function renderPdfPages(pdf: Buffer, dir: string, name: string): string[] {
  fs.mkdirSync(dir, { recursive: true });
  const pdfPath = path.join(dir, `${name}.pdf`);
  fs.writeFileSync(pdfPath, pdf);
  for (const old of fs.readdirSync(dir).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'))) fs.rmSync(path.join(dir, old));
  execFileSync('pdftoppm', ['-png', '-r', '80', pdfPath, path.join(dir, name)]);
  return fs.readdirSync(dir).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png')).sort().map((f) => path.join(dir, f));
}

type Grid = { size: number; dark: boolean[] };

/**
 * Reads the module grid of every square raster image in the PDF that looks like a QR code: the
 * images are pulled out as embedded (pdfimages), flattened on white, and the bounding box of the
 * dark pixels is cut into `size` × `size` cells, each read at its centre. The finder patterns
 * reach all four edges of that box, so no assumption about the quiet zone or scale is needed.
 */
async function qrGridsInPdf(pdf: Buffer, size: number): Promise<Grid[]> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'cert-qr-'));
  try {
    const pdfPath = path.join(dir, 'doc.pdf');
    fs.writeFileSync(pdfPath, pdf);
    execFileSync('pdfimages', ['-png', pdfPath, path.join(dir, 'img')]);
    const grids: Grid[] = [];
    for (const file of fs.readdirSync(dir).filter((f) => f.endsWith('.png'))) {
      const { data, info } = await sharp(path.join(dir, file)).flatten({ background: '#ffffff' }).greyscale().raw().toBuffer({ resolveWithObject: true });
      if (info.width !== info.height || info.width < size) continue;
      const w = info.width;
      const isDark = (x: number, y: number) => data[(y * w + x) * info.channels]! < 128;
      let minX = w, minY = w, maxX = -1, maxY = -1;
      for (let y = 0; y < w; y++) {
        for (let x = 0; x < w; x++) {
          if (!isDark(x, y)) continue;
          minX = Math.min(minX, x); maxX = Math.max(maxX, x);
          minY = Math.min(minY, y); maxY = Math.max(maxY, y);
        }
      }
      if (maxX < 0) continue; // an all-light image, e.g. the alpha mask of the code
      const cell = (maxX - minX + 1) / size;
      const dark: boolean[] = [];
      for (let r = 0; r < size; r++) {
        for (let c = 0; c < size; c++) dark.push(isDark(Math.floor(minX + (c + 0.5) * cell), Math.floor(minY + (r + 0.5) * cell)));
      }
      grids.push({ size, dark });
    }
    return grids;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** The modules a QR encoder produces for `text` at the error correction level the certificate uses. */
function expectedGrid(text: string): Grid {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
  const dark: boolean[] = [];
  for (let r = 0; r < modules.size; r++) for (let c = 0; c < modules.size; c++) dark.push(modules.get(r, c) === 1);
  return { size: modules.size, dark };
}

/**
 * No QR decoder is installed, so the code is checked the other way round: the URL printed on the
 * certificate is encoded again and its modules must equal, cell for cell, those of a QR image in
 * the PDF. Two different URLs give different grids (the caller checks that too), so a match means
 * the code a phone scans leads to the URL that is printed.
 */
export async function pdfQrEncodes(pdf: Buffer, url: string): Promise<boolean> {
  const want = expectedGrid(url);
  const grids = await qrGridsInPdf(pdf, want.size);
  return grids.some((g) => g.dark.every((d, i) => d === want.dark[i]));
}
