/**
 * Backup while the server works, restore into a fresh folder (server/backup/). The app runs with
 * its database on disk; a coach's autosaves go on and a clip is uploaded while the backup runs.
 * What had been acknowledged before the backup began is the reference, read from the live
 * database and the uploads folder outside the backup code: every one of those rows is in the
 * restored database unchanged (except the autosaved clip's revision and measures, which may be
 * later, and then consistently so: revision R holds exactly the landmarks of saves 1…R), and every
 * one of those media files is restored with the same SHA-256 (computed here with node:crypto).
 * Rows acknowledged after the backup began may or may not be in. Also: a restore refuses a
 * non-empty installation (function and `npm run restore` command) and a damaged backup.
 */
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { onPostgres, titleSkippedWhen } from '../support/test-db';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import { createDb, migrate, type Db } from '../../server/db/knex';
import { backupInstallation, BackupError } from '../../server/backup/backup';
import { restoreInstallation, RestoreError, installationContents } from '../../server/backup/restore';
import { localMediaStore } from '../../server/storage/local-media-store';
import { MANIFEST_NAME, restoreMarkerPath } from '../../server/backup/backup-manifest';
import type { ClipAnnotationsWrite, FrameLandmarks } from '../../src/contracts/annotations';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let work: { dir: string; cleanup: () => Promise<void> };
let assessmentId: number;
let clipA: number;
let restoredDb: Db | undefined;

/** The media folders of the uploads folder (the rest is the test app's database and temp files). */
const MEDIA_FOLDERS = ['clips', 'assessments', 'exercises', 'clinics'];

/** SHA-256 of every media file under `root`, by its path relative to `root` (`/`-separated). */
function mediaChecksums(root: string): Map<string, string> {
  const out = new Map<string, string>();
  const walk = (dir: string, rel: string) => {
    for (const e of fs.existsSync(dir) ? fs.readdirSync(dir, { withFileTypes: true }) : []) {
      if (e.name.startsWith('.')) continue;
      if (e.isDirectory()) walk(path.join(dir, e.name), `${rel}${e.name}/`);
      else
        out.set(
          `${rel}${e.name}`,
          crypto
            .createHash('sha256')
            .update(fs.readFileSync(path.join(dir, e.name)))
            .digest('hex'),
        );
    }
  };
  for (const f of MEDIA_FOLDERS) walk(path.join(root, f), `${f}/`);
  return out;
}

/** Every row of every table, as JSON strings per table. */
async function dump(db: Db): Promise<Map<string, string[]>> {
  const tables = (await db.raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name")) as {
    name: string;
  }[];
  const out = new Map<string, string[]>();
  for (const { name } of tables)
    out.set(
      name,
      ((await db(name).select('*')) as unknown[]).map((r) => JSON.stringify(r)),
    );
  return out;
}

const frame = (n: number): FrameLandmarks => ({
  frame: n,
  side: 'right',
  points: { hip: { x: 0.4 + n / 1000, y: 0.4 }, knee: { x: 0.45, y: 0.6 }, ankle: { x: 0.42, y: 0.8 } },
});
/** Save number `base + 1` marks frames 0…base: each save adds one frame, so revision R holds frames 0…R−1. */
const saveOn = (base: number): ClipAnnotationsWrite => ({
  baseRevision: base,
  landmarks: Array.from({ length: base + 1 }, (_, i) => frame(i)),
  events: [],
  scale: null,
});

async function upload(file: string): Promise<number> {
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as number;
}

beforeAll(async () => {
  work = await tempDir('backup');
  t = await makeTestApp({}, { onDisk: true });
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  clipA = await upload(await makeClip(path.join(work.dir, 'a.mp4'), { fps: 30, width: 160, height: 90, seconds: 2 }));
  await t.worker!.idle();
  for (let base = 0; base < 3; base++) expect((await c.put(`/api/clips/${clipA}/annotations`, saveOn(base))).status).toBe(200);
}, 180_000);
afterAll(async () => {
  await restoredDb?.destroy();
  await t?.close();
  await work?.cleanup();
});

describe.skipIf(onPostgres)(
  titleSkippedWhen(
    onPostgres,
    'backup while autosaves and an upload go on, restore into a fresh folder',
    'npm run backup copies a SQLite installation; a PostgreSQL database is backed up with pg_dump',
  ),
  () => {
    const backupDir = () => path.join(work.dir, 'backup');
    const target = () => ({ dbFile: path.join(work.dir, 'restored', 'db.sqlite'), uploadsDir: path.join(work.dir, 'restored', 'uploads') });

    it('restores every row and every media file acknowledged before the backup began', async () => {
      const clipB = path.join(work.dir, 'b.mp4');
      await makeClip(clipB, { fps: 30, width: 160, height: 90, seconds: 1 });
      // What was acknowledged before the backup began.
      const ackedRows = await dump(t.db);
      const ackedFiles = mediaChecksums(t.config.uploadsDir);
      const ackedRevision = 3;
      expect(ackedFiles.size).toBeGreaterThan(60); // clip A: original, manifest, 60 frames and thumbnails

      let backingUp = false;
      let savesDuringBackup = 0;
      let stop = false;
      let revision = ackedRevision;
      const load = (async () => {
        while (!stop && revision < 59) {
          const res = await c.put(`/api/clips/${clipA}/annotations`, saveOn(revision));
          expect(res.status, JSON.stringify(res.body)).toBe(200);
          revision = res.body.revision as number;
          if (backingUp) savesDuringBackup++;
        }
      })();
      const uploading = upload(clipB);
      const lines: string[] = [];
      backingUp = true;
      const manifest = await backupInstallation({
        dbFile: t.config.dbFile,
        store: localMediaStore(t.config.uploadsDir),
        dir: backupDir(),
        pagesPerStep: 1,
        progress: (l) => lines.push(l),
      });
      backingUp = false;
      stop = true;
      await load;
      await uploading;
      await t.worker!.idle();
      expect(savesDuringBackup).toBeGreaterThan(0);
      expect(lines.some((l) => l.startsWith('database: '))).toBe(true);
      expect(lines.some((l) => l.startsWith(`media: ${manifest.media.length} of ${manifest.media.length} files (`))).toBe(true);
      expect(fs.existsSync(path.join(backupDir(), MANIFEST_NAME))).toBe(true);

      const restoreLines: string[] = [];
      await restoreInstallation({ dir: backupDir(), ...target(), progress: (l) => restoreLines.push(l) });
      expect(restoreLines).toContain('checking: every checksum matches');
      expect(restoreLines.at(-1)).toMatch(/^restore complete/);

      // Media: every acknowledged file, byte for byte (by checksum).
      const restoredFiles = mediaChecksums(target().uploadsDir);
      const lostOrChanged = [...ackedFiles].filter(([key, sum]) => restoredFiles.get(key) !== sum).map(([key]) => key);
      expect(lostOrChanged).toEqual([]);

      // Rows: every acknowledged row, unchanged, but for the rows the autosaves under way move on.
      restoredDb = createDb(target().dbFile);
      expect(await restoredDb.raw('pragma integrity_check')).toEqual([{ integrity_check: 'ok' }]);
      const restoredRows = await dump(restoredDb);
      const movedOn = (table: string, row: Record<string, unknown>) =>
        (table === 'clips' && row['id'] === clipA) || (table === 'measure_snapshots' && row['clip_id'] === clipA);
      const missing: string[] = [];
      const moved: string[] = [];
      for (const [table, rows] of ackedRows) {
        const restored = new Set(restoredRows.get(table) ?? []);
        for (const r of rows) {
          if (restored.has(r)) continue;
          (movedOn(table, JSON.parse(r) as Record<string, unknown>) ? moved : missing).push(`${table}: ${r}`);
        }
      }
      expect(missing).toEqual([]);

      // The autosaved clip: a revision at least the acknowledged one, and its landmarks exactly those of that revision.
      const restoredClip = await restoredDb('clips').where({ id: clipA }).first<{ annotation_revision: number }>();
      const r = restoredClip.annotation_revision;
      expect(r).toBeGreaterThanOrEqual(ackedRevision);
      expect(r).toBeLessThanOrEqual(revision);
      const frames = (await restoredDb('clip_landmarks').where({ clip_id: clipA }).distinct('frame').orderBy('frame')).map((f) => f.frame);
      expect(frames).toEqual(Array.from({ length: r }, (_, i) => i));
      // Measures are computed when read, not on save: a snapshot, if any, is of a revision the restored clip has reached.
      const snapshots = await restoredDb('measure_snapshots').where({ clip_id: clipA }).select('annotation_revision');
      expect(snapshots.length).toBeLessThanOrEqual(1);
      for (const s of snapshots) expect(s.annotation_revision).toBeLessThanOrEqual(r);
      if (r === ackedRevision) expect(moved).toEqual([]);

      // Whatever clip the snapshot holds as ready has its frames restored (media came after the snapshot).
      for (const clip of await restoredDb('clips').where({ status: 'ready' }).select('id')) {
        expect(fs.existsSync(path.join(target().uploadsDir, 'clips', String(clip.id), 'manifest.json')), `clip ${clip.id}`).toBe(true);
      }
    }, 240_000);

    it('refuses to restore into an installation with data, leaving it as it was (also as npm run restore)', async () => {
      const before = mediaChecksums(target().uploadsDir);
      await expect(restoreInstallation({ dir: backupDir(), ...target() })).rejects.toThrow(RestoreError);
      await expect(restoreInstallation({ dir: backupDir(), ...target() })).rejects.toThrow(
        /Restore needs an empty installation, but this one has data/,
      );
      expect(mediaChecksums(target().uploadsDir)).toEqual(before);

      const run = spawnSync('npx', ['tsx', 'scripts/restore.ts', backupDir()], {
        encoding: 'utf8',
        env: { ...process.env, DB_FILE: target().dbFile, UPLOADS_DIR: target().uploadsDir },
      });
      expect(run.status).toBe(1);
      expect(run.stderr).toContain('restore refused: Restore needs an empty installation');
    }, 60_000);

    it('refuses a damaged backup before writing anything, and a folder that is not a finished backup', async () => {
      const manifest = JSON.parse(fs.readFileSync(path.join(backupDir(), MANIFEST_NAME), 'utf8')) as { media: { key: string }[] };
      const damaged = path.join(backupDir(), 'media', ...manifest.media[5]!.key.split('/'));
      const original = fs.readFileSync(damaged);
      const flipped = Buffer.from(original);
      flipped[flipped.length >> 1]! ^= 0xff;
      fs.writeFileSync(damaged, flipped);
      const fresh = { dbFile: path.join(work.dir, 'second', 'db.sqlite'), uploadsDir: path.join(work.dir, 'second', 'uploads') };
      try {
        await expect(restoreInstallation({ dir: backupDir(), ...fresh })).rejects.toThrow(
          new RegExp(`${manifest.media[5]!.key} does not match`),
        );
        expect(await installationContents(fresh.dbFile, fresh.uploadsDir)).toEqual([]);
      } finally {
        fs.writeFileSync(damaged, original);
      }
      await expect(restoreInstallation({ dir: path.join(work.dir, 'nothing-here'), ...fresh })).rejects.toThrow(/not a complete backup/);
    });

    it('a restore killed part-way (SIGKILL) leaves the installation marked: nothing opens its database; the next restore starts over', async () => {
      const killed = { dbFile: path.join(work.dir, 'killed', 'db.sqlite'), uploadsDir: path.join(work.dir, 'killed', 'uploads') };
      // The restore kills itself at its first media progress line: the database is in, the media part-way.
      const script = `import { restoreInstallation } from './server/backup/restore.ts';
        await restoreInstallation({ dir: ${JSON.stringify(backupDir())}, dbFile: ${JSON.stringify(killed.dbFile)}, uploadsDir: ${JSON.stringify(killed.uploadsDir)},
          progress: (line) => line.startsWith('media: ') && process.kill(process.pid, 'SIGKILL') });`;
      const run = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], { encoding: 'utf8' });
      expect(run.signal, run.stderr).toBe('SIGKILL');
      expect(await installationContents(killed.dbFile, killed.uploadsDir)).not.toEqual([]);
      expect(fs.existsSync(restoreMarkerPath(killed.dbFile))).toBe(true);

      // The server, the worker and npm run migrate open the database through createDb: refused, saying why.
      expect(() => createDb(killed.dbFile)).toThrow(/half-restored: a restore into it did not finish/);
      const migrateRun = spawnSync('npx', ['tsx', 'scripts/migrate.ts'], {
        encoding: 'utf8',
        env: { ...process.env, DATABASE_URL: '', DB_FILE: killed.dbFile, UPLOADS_DIR: killed.uploadsDir },
      });
      expect(migrateRun.status).not.toBe(0);
      expect(migrateRun.stderr).toContain('half-restored');

      const lines: string[] = [];
      await restoreInstallation({ dir: backupDir(), ...killed, progress: (l) => lines.push(l) });
      expect(lines[0]).toMatch(/^an unfinished restore is there/);
      expect(fs.existsSync(restoreMarkerPath(killed.dbFile))).toBe(false);
      // Outside reference: checksums computed here over the backup's own media folder.
      expect(mediaChecksums(killed.uploadsDir)).toEqual(mediaChecksums(path.join(backupDir(), 'media')));
      const again = createDb(killed.dbFile);
      try {
        expect(await dump(again)).toEqual(await dump(restoredDb!));
      } finally {
        await again.destroy();
      }
    }, 120_000);

    it('refuses a backup made by a newer version (a migration this one does not have) before writing anything', async () => {
      const source = path.join(work.dir, 'newer', 'db.sqlite');
      const db = createDb(source);
      try {
        await migrate(db);
        await db('knex_migrations').insert({ name: '20991231000000_from_a_newer_version.ts', batch: 2, migration_time: new Date() });
      } finally {
        await db.destroy();
      }
      const newerBackup = path.join(work.dir, 'newer', 'backup');
      await backupInstallation({ dbFile: source, store: localMediaStore(path.join(work.dir, 'newer', 'uploads')), dir: newerBackup });
      const fresh = { dbFile: path.join(work.dir, 'third', 'db.sqlite'), uploadsDir: path.join(work.dir, 'third', 'uploads') };
      await expect(restoreInstallation({ dir: newerBackup, ...fresh })).rejects.toThrow(
        /migration 20991231000000_from_a_newer_version\.ts, which this version of Trailframe does not know/,
      );
      expect(await installationContents(fresh.dbFile, fresh.uploadsDir)).toEqual([]);
      expect(fs.existsSync(restoreMarkerPath(fresh.dbFile))).toBe(false);
    }, 60_000);

    it('refuses a manifest that is JSON but no backup manifest (null, a field missing or of another type) as damaged, writing nothing', async () => {
      const manifest = JSON.parse(fs.readFileSync(path.join(backupDir(), MANIFEST_NAME), 'utf8')) as Record<string, unknown>;
      const fresh = { dbFile: path.join(work.dir, 'fourth', 'db.sqlite'), uploadsDir: path.join(work.dir, 'fourth', 'uploads') };
      const variants: [unknown, RegExp][] = [
        [null, /not a backup manifest \(at its top level\)/],
        [{ ...manifest, media: undefined }, /not a backup manifest \(at media\)/],
        [{ ...manifest, database: { size: '1', sha256: 'x' } }, /not a backup manifest \(at database\.size\)/],
        [{ ...manifest, format: 'other/9' }, /of format "other\/9"/],
      ];
      for (const [i, [content, message]] of variants.entries()) {
        const dir = path.join(work.dir, `odd-manifest-${i}`);
        fs.mkdirSync(dir, { recursive: true });
        fs.writeFileSync(path.join(dir, MANIFEST_NAME), JSON.stringify(content));
        await expect(restoreInstallation({ dir, ...fresh })).rejects.toThrow(message);
        await expect(restoreInstallation({ dir, ...fresh })).rejects.toThrow(RestoreError);
      }
      expect(await installationContents(fresh.dbFile, fresh.uploadsDir)).toEqual([]);
      expect(fs.existsSync(restoreMarkerPath(fresh.dbFile))).toBe(false);
    });

    it('backs up only into a new or empty folder', async () => {
      await expect(
        backupInstallation({ dbFile: t.config.dbFile, store: localMediaStore(t.config.uploadsDir), dir: backupDir() }),
      ).rejects.toThrow(BackupError);
    });
  },
);
