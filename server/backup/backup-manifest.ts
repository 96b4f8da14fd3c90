/**
 * The layout of a backup folder, shared by `backup.ts` and `restore.ts`:
 *
 *     DIR/database.sqlite        the database as of the snapshot (SQLite's online backup)
 *     DIR/media/<key>            each media object, by its MediaStore key
 *     DIR/backup-manifest.json   written last: every file with its size and SHA-256
 *
 * A folder without the manifest is an unfinished backup and is never restored.
 */
import crypto from 'node:crypto';
import { once } from 'node:events';
import fs from 'node:fs';
import path from 'node:path';
import type { Readable } from 'node:stream';

export const MANIFEST_NAME = 'backup-manifest.json';
export const DATABASE_NAME = 'database.sqlite';
export const MEDIA_DIR = 'media';
/** Changes when the layout does; restore refuses other versions. */
export const BACKUP_FORMAT = 'trailframe-backup/1';

/**
 * Beside `DB_FILE` while a restore writes (`<DB_FILE>.restore-incomplete`): a restore killed part-way
 * leaves it, the server refuses to open that database ({@link assertNoUnfinishedRestore}) and the next
 * restore clears what the killed one wrote before starting over.
 */
export function restoreMarkerPath(dbFile: string): string {
  return `${dbFile}.restore-incomplete`;
}

/** Throws when a restore into `dbFile` began and did not finish (the installation is half-restored). */
export function assertNoUnfinishedRestore(dbFile: string): void {
  if (!fs.existsSync(restoreMarkerPath(dbFile))) return;
  throw new Error(
    `The installation at ${dbFile} is half-restored: a restore into it did not finish (${restoreMarkerPath(dbFile)} is there). Run npm run restore again with the backup's folder; it starts over.`,
  );
}

/** One copied file: its size and SHA-256 (hex). */
export interface BackupFile {
  size: number;
  sha256: string;
}

export interface BackupManifest {
  format: typeof BACKUP_FORMAT;
  /** When the database snapshot was taken (ISO). */
  snapshotAt: string;
  /** The last migration applied in the snapshot. */
  schema: string | null;
  database: BackupFile;
  /** Media objects by key, sorted. */
  media: ({ key: string } & BackupFile)[];
}

/** Progress lines for a terminal (or a test's list). */
export type ProgressReporter = (line: string) => void;

/** Streams `source` into `target` (created with its folders), answering size and SHA-256 of the bytes. */
export async function copyHashing(source: Readable, target: string): Promise<BackupFile> {
  await fs.promises.mkdir(path.dirname(target), { recursive: true });
  const hash = crypto.createHash('sha256');
  let size = 0;
  const out = fs.createWriteStream(target);
  try {
    for await (const chunk of source) {
      const buf = chunk as Buffer;
      hash.update(buf);
      size += buf.length;
      if (!out.write(buf)) await once(out, 'drain');
    }
  } finally {
    await new Promise<void>((resolve, reject) => out.end((err?: Error | null) => (err ? reject(err) : resolve())));
  }
  return { size, sha256: hash.digest('hex') };
}

/** Size and SHA-256 of a file. */
export async function hashFile(file: string): Promise<BackupFile> {
  const hash = crypto.createHash('sha256');
  let size = 0;
  for await (const chunk of fs.createReadStream(file)) {
    hash.update(chunk as Buffer);
    size += (chunk as Buffer).length;
  }
  return { size, sha256: hash.digest('hex') };
}

/** The path of a media key inside a backup folder (keys are `/`-separated, checked by the store). */
export function mediaPath(dir: string, key: string): string {
  return path.join(dir, MEDIA_DIR, ...key.split('/'));
}

/** Bytes for people: 1.5 MB. */
export function formatBytes(n: number): string {
  if (n < 1024 * 1024) return `${Math.round(n / 1024)} kB`;
  return `${(n / (1024 * 1024)).toFixed(1)} MB`;
}

/**
 * Reports the count of `total` files done about twenty times over the run (and at the last one):
 * call it after each file with the number done.
 */
export function countReporter(total: number, line: (done: number) => string, say: ProgressReporter): (done: number) => void {
  const step = Math.max(1, Math.ceil(total / 20));
  let next = 1;
  return (done) => {
    if (done < next && done !== total) return;
    say(line(done));
    next = done + step;
  };
}
