import 'server-only';
// Object storage on the local disk (the default, for one app server). The content type sits in a
// small sidecar file under `.types/`, a folder no valid key can reach; writes go through a
// temporary file and a rename so a reader never sees half a photo.
import fs from 'node:fs/promises';
import path from 'node:path';
import crypto from 'node:crypto';
import { isValidKey, type ObjectStorage, type StoredObject } from './types';

export class DiskStorage implements ObjectStorage {
  private readonly root: string;

  constructor(root: string) {
    this.root = path.resolve(root);
  }

  private paths(key: string): { data: string; type: string } {
    // The drivers are reached through storageFor(), which checks keys; this guards direct use.
    if (!isValidKey(key)) throw new Error(`invalid storage key: ${JSON.stringify(key)}`);
    return { data: path.join(this.root, key), type: path.join(this.root, '.types', key) };
  }

  private async writeAtomically(file: string, bytes: Uint8Array | string): Promise<void> {
    await fs.mkdir(path.dirname(file), { recursive: true });
    const tmp = `${file}.${crypto.randomBytes(6).toString('hex')}.tmp`;
    await fs.writeFile(tmp, bytes);
    await fs.rename(tmp, file);
  }

  async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
    const p = this.paths(key);
    await this.writeAtomically(p.type, contentType);
    await this.writeAtomically(p.data, bytes);
  }

  async get(key: string): Promise<StoredObject | null> {
    const p = this.paths(key);
    try {
      const [bytes, contentType] = await Promise.all([fs.readFile(p.data), fs.readFile(p.type, 'utf8').catch(() => 'application/octet-stream')]);
      return { bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), contentType };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw err;
    }
  }

  async delete(key: string): Promise<void> {
    const p = this.paths(key);
    await fs.rm(p.data, { force: true });
    await fs.rm(p.type, { force: true });
  }

  async exists(key: string): Promise<boolean> {
    try {
      return (await fs.stat(this.paths(key).data)).isFile();
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return false;
      throw err;
    }
  }
}
