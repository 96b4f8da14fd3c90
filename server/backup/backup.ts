/**
 * `npm run backup -- DIR`: a consistent copy of a running installation.
 *
 * 1. The database through SQLite's online backup API (better-sqlite3 `db.backup()`): a snapshot
 *    of one committed state, taken in small steps while the server goes on writing (a write by
 *    another connection makes SQLite start the copy again, so what lands is one state).
 * 2. Then the media, key by key through the MediaStore, each with its SHA-256. Media is written
 *    before the rows that name it commit, so every object a snapshot row names is there when the
 *    keys are listed after the snapshot; objects added since come along and are harmless.
 * 3. Last, `backup-manifest.json` with every file's size and checksum: a folder without it is not
 *    a backup.
 */
import fs from 'node:fs';
import path from 'node:path';
import { createRequire } from 'node:module';
import { MissingMediaError, type MediaStore } from '../storage/media-store';
import { MEDIA_KEY_ROOTS } from '../storage/media-keys';
import {
  BACKUP_FORMAT,
  DATABASE_NAME,
  MANIFEST_NAME,
  copyHashing,
  countReporter,
  formatBytes,
  hashFile,
  mediaPath,
  type BackupManifest,
  type ProgressReporter,
} from './backup-manifest';

const require = createRequire(import.meta.url);

/** The part of a better-sqlite3 `Database` a backup uses. */
interface SqliteSource {
  pragma(source: string): unknown;
  backup(destination: string, options?: { progress?: (info: { totalPages: number; remainingPages: number }) => number }): Promise<unknown>;
  close(): void;
}
interface SqliteReader {
  prepare(sql: string): { pluck(): { get(): unknown } };
  close(): void;
}
type SqliteOpen = new (file: string, options?: { readonly?: boolean; fileMustExist?: boolean }) => SqliteSource & SqliteReader;

export interface BackupOptions {
  /** The live database file (`DB_FILE`). */
  dbFile: string;
  /** The media as the server stores it. */
  store: MediaStore;
  /** The backup folder: new or empty. */
  dir: string;
  progress?: ProgressReporter;
  /** Pages copied per step of the online backup (SQLite's default 100; fewer lets writers in more often). */
  pagesPerStep?: number;
  clock?: () => Date;
}

/** A backup folder that cannot be written into. */
export class BackupError extends Error {}

/** Writes a backup of the database and media into `dir`; answers its manifest. */
export async function backupInstallation(o: BackupOptions): Promise<BackupManifest> {
  const say = o.progress ?? (() => undefined);
  const clock = o.clock ?? (() => new Date());
  if (!fs.existsSync(o.dbFile)) throw new BackupError(`There is no database at ${o.dbFile} (set DB_FILE to the installation's).`);
  await fs.promises.mkdir(o.dir, { recursive: true });
  const present = await fs.promises.readdir(o.dir);
  if (present.length)
    throw new BackupError(`${o.dir} is not empty: back up into a new or empty folder (found ${present.slice(0, 3).join(', ')}).`);

  // 1. The database.
  const Database = require('better-sqlite3') as SqliteOpen;
  const source = new Database(o.dbFile, { fileMustExist: true });
  source.pragma('busy_timeout = 5000');
  const dbTarget = path.join(o.dir, DATABASE_NAME);
  let shown = -1;
  let remaining = Infinity;
  let allAtOnce = false;
  try {
    await source.backup(dbTarget, {
      progress: ({ totalPages, remainingPages }) => {
        // Writes by the server make SQLite start over; after the first restart the rest goes in one
        // step (one read of a committed state: in WAL mode the server's writers go on meanwhile).
        if (remainingPages > remaining) allAtOnce = true;
        remaining = remainingPages;
        const pct = totalPages ? Math.floor((100 * (totalPages - remainingPages)) / totalPages) : 100;
        if (pct >= shown + 10) say(`database: ${(shown = pct)} % of ${totalPages} pages`);
        return allAtOnce ? 0x7fffffff : (o.pagesPerStep ?? 100);
      },
    });
  } finally {
    source.close();
  }
  const snapshotAt = clock().toISOString();
  const snapshot = new Database(dbTarget, { readonly: true, fileMustExist: true });
  let schema: string | null;
  try {
    schema = (snapshot.prepare('select name from knex_migrations order by id desc limit 1').pluck().get() as string | undefined) ?? null;
  } finally {
    snapshot.close();
  }
  const database = await hashFile(dbTarget);
  say(`database: copied (${formatBytes(database.size)}), schema ${schema ?? 'empty'}`);

  // 2. The media, by key.
  const keys: string[] = [];
  for (const root of MEDIA_KEY_ROOTS) keys.push(...(await o.store.list(root)));
  // Writes in progress of the legacy object helper (`*.part`) are not objects yet.
  const objects = keys.filter((k) => !k.endsWith('.part')).sort();
  const media: BackupManifest['media'] = [];
  let bytes = 0;
  const report = countReporter(objects.length, (n) => `media: ${n} of ${objects.length} files (${formatBytes(bytes)})`, say);
  for (const [i, key] of objects.entries()) {
    try {
      const file = await copyHashing(await o.store.get(key), mediaPath(o.dir, key));
      media.push({ key, ...file });
      bytes += file.size;
    } catch (err) {
      // Removed since it was listed (its subject was deleted after the snapshot): not needed.
      if (!(err instanceof MissingMediaError)) throw err;
      await fs.promises.rm(mediaPath(o.dir, key), { force: true });
    }
    report(i + 1);
  }
  if (!objects.length) say('media: none');

  // 3. The manifest, last.
  const manifest: BackupManifest = { format: BACKUP_FORMAT, snapshotAt, schema, database, media };
  const temp = path.join(o.dir, `.${MANIFEST_NAME}.tmp`);
  await fs.promises.writeFile(temp, JSON.stringify(manifest, null, 1));
  await fs.promises.rename(temp, path.join(o.dir, MANIFEST_NAME));
  say(`backup complete: ${o.dir} (database and ${media.length} media files, ${formatBytes(bytes + database.size)})`);
  return manifest;
}
