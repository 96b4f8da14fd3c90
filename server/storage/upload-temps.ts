import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

/** The folder of upload temp files inside the uploads folder (`uploads/tmp`). */
export function uploadTempDir(uploadsDir: string): string {
  return path.join(uploadsDir, 'tmp');
}

/**
 * The folder of resumable uploads' partial files (`uploads/tmp/resumable`): each upload's bytes so
 * far (`<id>`) beside its details (`<id>.json`). They outlive a restart (the start-up sweep of
 * `*.upload` files leaves them), so an upload resumes where it stopped; abandoned ones go by age.
 */
export function resumableUploadDir(uploadsDir: string): string {
  return path.join(uploadTempDir(uploadsDir), 'resumable');
}

/** Suffix of an upload's temp file (`<uuid>.upload`); nothing else in the folder is swept. */
export const UPLOAD_TEMP_SUFFIX = '.upload';

/**
 * The temp files of uploads being received. A request owns its file from {@link create} until
 * {@link release}; a file nobody owns is debris of an interrupted upload (the server was killed
 * mid-request) and is removed by {@link sweep}.
 */
export interface UploadTemps {
  /** A fresh temp file path, owned by the caller until released. */
  create(): string;
  /** The request that owned `file` has ended (its file is removed by the caller or by a sweep). */
  release(file: string): void;
  /** Removes `file` (if still there: an accepted upload moved into the store is not) and releases it. */
  discard(file: string): Promise<void>;
  /**
   * Removes upload temp files nobody owns: all of them (start-up, `olderThanMs` 0) or those not
   * written for `olderThanMs`. Returns the removed paths.
   */
  sweep(olderThanMs?: number): Promise<string[]>;
  /** Sweeps files past `maxAgeMs` every `everyMs`; the timer does not keep the process alive. */
  startSweeping(opts: { everyMs: number; maxAgeMs: number }): NodeJS.Timeout;
}

/**
 * The upload temp files of `dir`, which belongs to this server process. Creating it is the
 * start-up sweep: every upload temp file already there is debris (no request of ours owns it yet)
 * and is removed at once.
 */
export function uploadTemps(dir: string, onError: (err: Error) => void = () => undefined): UploadTemps {
  const owned = new Set<string>();
  fs.mkdirSync(dir, { recursive: true });
  for (const name of fs.readdirSync(dir)) {
    if (name.endsWith(UPLOAD_TEMP_SUFFIX)) fs.rmSync(path.join(dir, name), { force: true });
  }

  async function sweep(olderThanMs = 0): Promise<string[]> {
    const removed: string[] = [];
    const names = await fs.promises.readdir(dir).catch(() => [] as string[]);
    const now = Date.now();
    for (const name of names) {
      if (!name.endsWith(UPLOAD_TEMP_SUFFIX)) continue;
      const file = path.join(dir, name);
      if (owned.has(file)) continue;
      const stat = await fs.promises.stat(file).catch(() => null);
      if (!stat?.isFile() || now - stat.mtimeMs < olderThanMs) continue;
      await fs.promises.rm(file, { force: true });
      removed.push(file);
    }
    return removed;
  }

  return {
    create() {
      const file = path.join(dir, `${crypto.randomUUID()}${UPLOAD_TEMP_SUFFIX}`);
      owned.add(file);
      return file;
    },
    release(file) {
      owned.delete(file);
    },
    async discard(file) {
      await removeUpload(file);
      owned.delete(file);
    },

    sweep,
    startSweeping({ everyMs, maxAgeMs }) {
      const timer = setInterval(() => {
        sweep(maxAgeMs).catch((err: Error) => onError(err));
      }, everyMs);
      timer.unref();
      return timer;
    },
  };
}

/** The first `bytes` bytes of an upload's temp file (fewer when it is shorter), to sniff what it is. */
export async function uploadHead(file: string, bytes: number): Promise<Buffer> {
  const handle = await fs.promises.open(file, 'r');
  try {
    const buffer = Buffer.alloc(bytes);
    const { bytesRead } = await handle.read(buffer, 0, bytes, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

/** Removes an upload's temp file if it is still there (an accepted one was moved into the store). */
export async function removeUpload(file: string): Promise<void> {
  await fs.promises.rm(file, { force: true });
}
