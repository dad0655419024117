import 'server-only';
// Checks and cleans an uploaded image: the type comes from the file's own bytes (never its name or
// the browser's word), and the image is re-encoded so no metadata survives — EXIF, GPS position,
// XMP, comments — only the pixels, turned upright first.
import sharp from 'sharp';
import { fileTypeFromBuffer } from 'file-type';
import { AppError } from '@/lib/errors';

// HEIC is left out: the sharp build here cannot decode it, and the field app sends JPEG anyway.
export const ACCEPTED_IMAGE_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;

// A phone photo needs no more; larger ones are scaled down, which also bounds the decode work.
const MAX_EDGE_PX = 2560;

export type CleanImage = { bytes: Buffer; mime: 'image/jpeg' | 'image/png'; ext: 'jpg' | 'png'; width: number; height: number };

export async function cleanImage(input: Uint8Array, options: { keepPng?: boolean } = {}): Promise<CleanImage> {
  const detected = await fileTypeFromBuffer(input);
  if (!detected || !(ACCEPTED_IMAGE_TYPES as readonly string[]).includes(detected.mime)) {
    throw new AppError('unsupported_media_type', 'The file is not a photo: send a JPEG, PNG or WebP image.', { file: 'The file is not a JPEG, PNG or WebP image' });
  }
  let pipeline;
  try {
    // limitInputPixels guards against decompression bombs (a small file that inflates hugely).
    pipeline = sharp(input, { limitInputPixels: 50_000_000, failOn: 'error' }).rotate().resize({ width: MAX_EDGE_PX, height: MAX_EDGE_PX, fit: 'inside', withoutEnlargement: true });
    const png = options.keepPng && detected.mime === 'image/png';
    // No withMetadata(): sharp then writes none of the original's metadata.
    const { data, info } = png
      ? await pipeline.png({ compressionLevel: 9 }).toBuffer({ resolveWithObject: true })
      : await pipeline.jpeg({ quality: 82, mozjpeg: true }).toBuffer({ resolveWithObject: true });
    return { bytes: data, mime: png ? 'image/png' : 'image/jpeg', ext: png ? 'png' : 'jpg', width: info.width, height: info.height };
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw new AppError('unsupported_media_type', 'The photo could not be read; it may be damaged. Take it again.', { file: 'The image could not be read' });
  }
}
