import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import type { Readable } from 'node:stream';
import { NotFoundError } from '../errors';

/**
 * Media stored by key (`exercises/4/media/9-v1.jpg`, `clinics/1/logo-v2.png`): put, read, remove.
 * Keys are built from numeric ids and our own names only (see `exercise-media-keys.ts`), never from
 * user input. The same calls as the key-based media store the processing layer uses, so these
 * objects move with it to object storage.
 */
export interface MediaObjects {
  /** Stores bytes under `key`, replacing what was there; readers see the old or the new object, never half. */
  put(key: string, body: Buffer): Promise<void>;
  /** A stream of the object. @throws {NotFoundError} when there is none. */
  get(key: string): Promise<Readable>;
  /** Removes one object (nothing when it is not there). */
  remove(key: string): Promise<void>;
  /** Removes every object under `prefix` (which ends with `/`). */
  removePrefix(prefix: string): Promise<void>;
}

const KEY = /^[a-z0-9-]+(\/[a-z0-9.-]+)+$/;

/** Reads a whole (small) object into memory: logos for PDFs and e-mails. */
export async function readObject(objects: MediaObjects, key: string): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of await objects.get(key)) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

/** Objects as files under `root` (the uploads folder). */
export function localMediaObjects(root: string): MediaObjects {
  const file = (key: string) => {
    if (!KEY.test(key) || key.includes('..')) throw new Error(`bad media key ${key}`);
    return path.join(root, ...key.split('/'));
  };
  return {
    async put(key, body) {
      const target = file(key);
      await fs.promises.mkdir(path.dirname(target), { recursive: true });
      const temp = `${target}.${crypto.randomUUID()}.part`;
      await fs.promises.writeFile(temp, body);
      await fs.promises.rename(temp, target);
    },
    async get(key) {
      const target = file(key);
      try {
        await fs.promises.access(target);
      } catch {
        throw new NotFoundError('File');
      }
      return fs.createReadStream(target);
    },
    async remove(key) {
      await fs.promises.rm(file(key), { force: true });
    },
    async removePrefix(prefix) {
      if (!prefix.endsWith('/')) throw new Error(`bad media prefix ${prefix}`);
      await fs.promises.rm(file(prefix.slice(0, -1)), { recursive: true, force: true });
    },
  };
}
