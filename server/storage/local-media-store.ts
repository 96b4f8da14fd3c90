import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { MissingMediaError, type MediaStore, type StoredObject } from './media-store';

/** Keys are `/`-separated names of letters, digits, `.`, `_` and `-`; no empty, `.` or `..` part. */
const KEY_PART = /^[A-Za-z0-9_-][A-Za-z0-9._-]*$/;

function parts(key: string, prefix = false): string[] {
  const body = prefix ? key.replace(/\/$/, '') : key;
  if ((prefix && !key.endsWith('/')) || !body) throw new Error(`bad media ${prefix ? 'prefix' : 'key'} "${key}"`);
  const list = body.split('/');
  if (!list.every((p) => KEY_PART.test(p) && p !== '.' && p !== '..')) throw new Error(`bad media key "${key}"`);
  return list;
}

const missing = (err: unknown) => (err as NodeJS.ErrnoException).code === 'ENOENT' || (err as NodeJS.ErrnoException).code === 'ENOTDIR';

/**
 * {@link MediaStore} in local folders: key `clips/12/frames/000001.jpg` is the file
 * `<root>/clips/12/frames/000001.jpg`. Writes go to a hidden temp file beside the target and are
 * renamed into place, so a reader never sees half an object.
 */
export function localMediaStore(root: string): MediaStore {
  fs.mkdirSync(root, { recursive: true });
  const fileOf = (key: string) => path.join(root, ...parts(key));
  const folderOf = (prefix: string) => path.join(root, ...parts(prefix, true));
  const tempBeside = (file: string) => path.join(path.dirname(file), `.${path.basename(file)}.${crypto.randomUUID()}.tmp`);

  async function replace(file: string, write: (temp: string) => Promise<void>): Promise<void> {
    await fs.promises.mkdir(path.dirname(file), { recursive: true });
    const temp = tempBeside(file);
    try {
      await write(temp);
      await fs.promises.rename(temp, file);
    } catch (err) {
      await fs.promises.rm(temp, { force: true });
      throw err;
    }
  }

  async function listFiles(dir: string, keyPrefix: string, out: string[]): Promise<void> {
    let entries: fs.Dirent[];
    try {
      entries = await fs.promises.readdir(dir, { withFileTypes: true });
    } catch (err) {
      if (missing(err)) return;
      throw err;
    }
    for (const e of entries) {
      if (e.name.startsWith('.')) continue; // temp files of writes in progress
      if (e.isDirectory()) await listFiles(path.join(dir, e.name), `${keyPrefix}${e.name}/`, out);
      else if (e.isFile()) out.push(`${keyPrefix}${e.name}`);
    }
  }

  return {
    async put(key, body) {
      const file = fileOf(key);
      await replace(file, async (temp) => {
        if (typeof body === 'string' || Buffer.isBuffer(body)) await fs.promises.writeFile(temp, body);
        else await pipeline(body as Readable, fs.createWriteStream(temp));
      });
    },

    async putFile(key, localFile) {
      const file = fileOf(key);
      await fs.promises.mkdir(path.dirname(file), { recursive: true });
      try {
        await fs.promises.rename(localFile, file);
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== 'EXDEV') throw err;
        // Another file system: copy, then drop the local file.
        await replace(file, (temp) => fs.promises.copyFile(localFile, temp));
        await fs.promises.rm(localFile, { force: true });
      }
    },

    async get(key, range) {
      try {
        const handle = await fs.promises.open(fileOf(key), 'r');
        return handle.createReadStream(range ? { start: range.start, end: range.end } : {});
      } catch (err) {
        if (missing(err) || (err as NodeJS.ErrnoException).code === 'EISDIR') throw new MissingMediaError(key);
        throw err;
      }
    },

    async stat(key): Promise<StoredObject | null> {
      try {
        const s = await fs.promises.stat(fileOf(key));
        return s.isFile() ? { key, size: s.size, modifiedAt: s.mtime } : null;
      } catch (err) {
        if (missing(err)) return null;
        throw err;
      }
    },

    async list(prefix) {
      const out: string[] = [];
      await listFiles(folderOf(prefix), prefix, out);
      return out.sort();
    },

    async remove(key) {
      await fs.promises.rm(fileOf(key), { force: true });
    },

    async removePrefix(prefix) {
      // Work still running may write into the folder while it goes (frames of a clip being erased or
      // deleted): Node then meets ENOTEMPTY and tries again, as it does for EBUSY.
      await fs.promises.rm(folderOf(prefix), { recursive: true, force: true, maxRetries: 10, retryDelay: 50 });
    },

    async withLocalFile(key, fn) {
      const file = fileOf(key);
      const s = await fs.promises.stat(file).catch((err: unknown) => {
        if (missing(err)) return null;
        throw err;
      });
      if (!s?.isFile()) throw new MissingMediaError(key);
      return fn(file);
    },

    async withLocalFolder(prefix, fn) {
      const dir = folderOf(prefix);
      await fs.promises.mkdir(dir, { recursive: true });
      // The folder is where the objects live already: publishing has nothing to do.
      return fn({ path: dir, publish: async () => undefined });
    },
  };
}
