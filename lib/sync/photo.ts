// Shrinks a photo on the phone before it waits in the outbox: a camera's 4–12 MB becomes a few
// hundred kB, and a small thumbnail is kept with the visit so it shows while offline.
// useWebWorker: false keeps browser-image-compression from loading its worker script from a CDN
// (our content security policy would block it, and a cellar has no network anyway).
import imageCompression from 'browser-image-compression';

export type CompressedPhoto = { bytes: ArrayBuffer; mime: 'image/jpeg'; thumbnail: string };

export class PhotoReadError extends Error {
  constructor() {
    super('That file is not a photo this phone can read. Take the photo again, or choose a JPEG or PNG.');
    this.name = 'PhotoReadError';
  }
}

export async function compressPhoto(file: File): Promise<CompressedPhoto> {
  if (!file.type.startsWith('image/') && file.type !== '') throw new PhotoReadError();
  try {
    const photo = await imageCompression(file, { maxSizeMB: 0.8, maxWidthOrHeight: 2048, useWebWorker: false, fileType: 'image/jpeg', initialQuality: 0.82 });
    const thumb = await imageCompression(photo, { maxSizeMB: 0.03, maxWidthOrHeight: 240, useWebWorker: false, fileType: 'image/jpeg', initialQuality: 0.7 });
    return { bytes: await photo.arrayBuffer(), mime: 'image/jpeg', thumbnail: await imageCompression.getDataUrlFromFile(thumb) };
  } catch {
    throw new PhotoReadError();
  }
}
