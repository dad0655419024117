// Renders the app icons in public/icons from the name-mark drawing. Run again after changing the mark:
// `npx tsx scripts/make-icons.ts`. The PNGs are committed, so builds never depend on this script.
import sharp from 'sharp';
import path from 'node:path';

const glyph = (pad: number) => `
<svg xmlns="http://www.w3.org/2000/svg" viewBox="${-pad} ${-pad} ${64 + pad * 2} ${64 + pad * 2}">
  <rect x="${-pad}" y="${-pad}" width="${64 + pad * 2}" height="${64 + pad * 2}" fill="#a8471f"/>
  <path d="M14 52V30a18 18 0 0 1 36 0v22" fill="none" stroke="#f7f5f0" stroke-width="5" stroke-linecap="round"/>
  <path d="M32 50c-6 0-9-4-9-8.5 0-5 4-7.5 5.5-12 2.5 3 3 5.5 2.5 8 2-1 3.5-3 4-5.5 3 3 6 6 6 9.5 0 4.5-3 8.5-9 8.5z" fill="#f7f5f0"/>
  <path d="M10 54h44" stroke="#f7f5f0" stroke-width="4" stroke-linecap="round"/>
</svg>`;

async function main() {
  const out = path.join(process.cwd(), 'public/icons');
  for (const size of [192, 512]) {
    await sharp(Buffer.from(glyph(2))).resize(size, size).png().toFile(path.join(out, `icon-${size}.png`));
    // Maskable icons keep the drawing inside the central safe zone.
    await sharp(Buffer.from(glyph(14))).resize(size, size).png().toFile(path.join(out, `maskable-${size}.png`));
  }
  await sharp(Buffer.from(glyph(2))).resize(180, 180).png().toFile(path.join(out, 'apple-touch-icon.png'));
  console.log('icons written to public/icons');
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
