// The object-storage contract shared by the disk and S3 drivers. Kept apart from index.ts so the
// drivers can be built and tested without reading the app's settings.
export type StoredObject = { bytes: Uint8Array; contentType: string };

export interface ObjectStorage {
  /** Writes (or replaces) the object at `key`. */
  put(key: string, bytes: Uint8Array, contentType: string): Promise<void>;
  /** The object, or null when there is none at `key`. */
  get(key: string): Promise<StoredObject | null>;
  /** Removes the object; removing a missing key is not an error. */
  delete(key: string): Promise<void>;
  exists(key: string): Promise<boolean>;
}

// A key is `<organisation id>/<segment>/.../<segment>`; every segment starts with a letter or digit,
// so no segment can be `.`/`..`, hidden, or collide with a driver's own bookkeeping.
const SEGMENT = /^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$/;

export function isValidKey(key: string): boolean {
  const parts = key.split('/');
  return key.length <= 1024 && parts.length >= 2 && parts.every((p) => SEGMENT.test(p));
}
