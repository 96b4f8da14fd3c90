/**
 * `npm run restore -- DIR`: puts a backup (see `backup.ts`) into an empty installation. Refuses an
 * installation with a database or media already; checks every file of the backup against its
 * SHA-256 before anything is written, and again as it is copied; on any failure removes what it
 * wrote, so the installation is left empty as it was found. While it writes, a marker beside the
 * database ({@link restoreMarkerPath}) says the installation is half-restored: a restore killed
 * part-way leaves it, the server will not start on it, and the next restore clears and starts over.
 */
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { MEDIA_KEY_ROOTS } from '../storage/media-keys';
import { localMediaStore } from '../storage/local-media-store';
import { knownMigrations } from '../db/knex';
import {
  BACKUP_FORMAT,
  DATABASE_NAME,
  MANIFEST_NAME,
  copyHashing,
  countReporter,
  formatBytes,
  hashFile,
  mediaPath,
  restoreMarkerPath,
  type BackupFile,
  type BackupManifest,
  type ProgressReporter,
} from './backup-manifest';

export interface RestoreOptions {
  /** The backup folder. */
  dir: string;
  /** Where the database goes (`DB_FILE`): must not exist yet. */
  dbFile: string;
  /** Where media goes (`UPLOADS_DIR`): must hold no media yet. */
  uploadsDir: string;
  progress?: ProgressReporter;
}

/** A restore that cannot go ahead; the message says why and what to do. */
export class RestoreError extends Error {}

/** Reads and checks the backup's manifest. */
export async function readBackupManifest(dir: string): Promise<BackupManifest> {
  const file = path.join(dir, MANIFEST_NAME);
  let read: unknown;
  try {
    read = JSON.parse(await fs.promises.readFile(file, 'utf8'));
  } catch {
    throw new RestoreError(`${dir} is not a complete backup: ${MANIFEST_NAME} is missing or unreadable (a backup writes it last).`);
  }
  const format = (read as { format?: unknown } | null)?.format;
  if (format !== undefined && format !== BACKUP_FORMAT)
    throw new RestoreError(`${dir} is a backup of format "${String(format)}"; this version restores "${BACKUP_FORMAT}".`);
  const parsed = ManifestSchema.safeParse(read);
  if (!parsed.success) {
    const where = parsed.error.issues[0]?.path.join('.') || 'its top level';
    throw new RestoreError(`${dir}/${MANIFEST_NAME} is not a backup manifest (at ${where}); the backup is damaged.`);
  }
  const manifest = parsed.data as BackupManifest;
  const badKey = manifest.media.find((m) => !MEDIA_KEY_ROOTS.some((root) => m.key.startsWith(root)) || m.key.split('/').includes('..'));
  if (badKey) throw new RestoreError(`${dir}/${MANIFEST_NAME} names "${badKey.key}", which is no media key; the backup is damaged.`);
  return manifest;
}

const FileSchema = z.object({ size: z.number().int().nonnegative(), sha256: z.string().regex(/^[0-9a-f]{64}$/) });
/** What `backup.ts` writes as `backup-manifest.json`. */
const ManifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  snapshotAt: z.string(),
  schema: z.string().nullable(),
  database: FileSchema,
  media: z.array(FileSchema.extend({ key: z.string().min(1) })),
});

/** What already makes the installation non-empty (nothing → empty). */
export async function installationContents(dbFile: string, uploadsDir: string): Promise<string[]> {
  const found: string[] = [];
  for (const f of [dbFile, `${dbFile}-wal`]) {
    const s = await fs.promises.stat(f).catch(() => null);
    if (s && s.size > 0) found.push(f);
  }
  for (const root of MEDIA_KEY_ROOTS) {
    const folder = path.join(uploadsDir, root);
    if ((await fs.promises.readdir(folder).catch(() => [])).length) found.push(folder);
  }
  return found;
}

function checkSame(what: string, expected: BackupFile, actual: BackupFile): void {
  if (expected.sha256 !== actual.sha256 || expected.size !== actual.size) {
    throw new RestoreError(
      `${what} does not match the backup's manifest (SHA-256 ${actual.sha256.slice(0, 12)}…, ${actual.size} bytes; expected ${expected.sha256.slice(0, 12)}…, ${expected.size} bytes). The backup is damaged; restore another one.`,
    );
  }
}

/** Size and SHA-256 of a file of the backup; a missing file answers a size that matches nothing. */
const hashInBackup = (file: string): Promise<BackupFile> => hashFile(file).catch(() => ({ size: -1, sha256: 'missing' }));

/** Removes what a restore writes: the database (and its temp, WAL and shared-memory files) and the media folders. */
async function removeRestored(dbFile: string, uploadsDir: string): Promise<void> {
  for (const f of [dbFile, `${dbFile}.restoring`, `${dbFile}-wal`, `${dbFile}-shm`]) await fs.promises.rm(f, { force: true });
  for (const root of MEDIA_KEY_ROOTS) await fs.promises.rm(path.join(uploadsDir, root), { recursive: true, force: true });
}

/** Restores the backup in `dir` into an empty installation. */
export async function restoreInstallation(o: RestoreOptions): Promise<BackupManifest> {
  const say = o.progress ?? (() => undefined);
  const manifest = await readBackupManifest(o.dir);
  const known = await knownMigrations();
  if (manifest.schema && !known.includes(manifest.schema)) {
    throw new RestoreError(
      `This backup's database has migration ${manifest.schema}, which this version of Trailframe does not know (its newest is ${known.at(-1)}): it was made by a newer version. Restore it with that version or a newer one.`,
    );
  }
  const marker = restoreMarkerPath(o.dbFile);
  if (fs.existsSync(marker)) {
    // What is there was written by a restore that was killed part-way (it began on an empty installation).
    say(`an unfinished restore is there (${marker}): removing what it wrote`);
    await removeRestored(o.dbFile, o.uploadsDir);
    await fs.promises.rm(marker, { force: true });
  }
  const existing = await installationContents(o.dbFile, o.uploadsDir);
  if (existing.length) {
    throw new RestoreError(
      `Restore needs an empty installation, but this one has data: ${existing.join(', ')}. Stop the server and move these away (or set DB_FILE and UPLOADS_DIR to new places), then run the restore again.`,
    );
  }
  const total = manifest.media.reduce((n, m) => n + m.size, manifest.database.size);
  say(`backup of ${manifest.snapshotAt}: database and ${manifest.media.length} media files, ${formatBytes(total)}`);

  // Every file checked before anything is written.
  checkSame(DATABASE_NAME, manifest.database, await hashInBackup(path.join(o.dir, DATABASE_NAME)));
  let checked = manifest.database.size;
  const n = manifest.media.length;
  const reportChecked = countReporter(
    n,
    (i) => `checking: ${i} of ${n} media files (${formatBytes(checked)} of ${formatBytes(total)})`,
    say,
  );
  for (const [i, m] of manifest.media.entries()) {
    checkSame(m.key, m, await hashInBackup(mediaPath(o.dir, m.key)));
    checked += m.size;
    reportChecked(i + 1);
  }
  say('checking: every checksum matches');

  await fs.promises.mkdir(path.dirname(o.dbFile), { recursive: true });
  await fs.promises.writeFile(marker, `A restore of ${o.dir} began at ${new Date().toISOString()} and has not finished.\n`);
  const written: string[] = [];
  try {
    const temp = `${o.dbFile}.restoring`;
    written.push(temp);
    checkSame(DATABASE_NAME, manifest.database, await copyHashing(fs.createReadStream(path.join(o.dir, DATABASE_NAME)), temp));
    written.push(o.dbFile);
    await fs.promises.rename(temp, o.dbFile);
    say(`database: restored to ${o.dbFile}`);

    const store = localMediaStore(o.uploadsDir);
    for (const root of MEDIA_KEY_ROOTS) written.push(path.join(o.uploadsDir, root));
    let copied = 0;
    const reportCopied = countReporter(n, (i) => `media: ${i} of ${n} files (${formatBytes(copied)})`, say);
    for (const [i, m] of manifest.media.entries()) {
      await store.put(m.key, fs.createReadStream(mediaPath(o.dir, m.key)));
      await store.withLocalFile(m.key, async (file) => checkSame(m.key, m, await hashFile(file)));
      copied += m.size;
      reportCopied(i + 1);
    }
  } catch (err) {
    for (const f of written) await fs.promises.rm(f, { recursive: true, force: true });
    await fs.promises.rm(marker, { force: true });
    throw err;
  }
  await fs.promises.rm(marker);
  say(`restore complete: start the server with DB_FILE=${o.dbFile} UPLOADS_DIR=${o.uploadsDir}`);
  return manifest;
}
