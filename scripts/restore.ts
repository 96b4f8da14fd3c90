/**
 * `npm run restore -- DIR`: restores the backup in DIR into the empty installation named by
 * `DB_FILE` and `UPLOADS_DIR` (server/backup/restore.ts). Start the server afterwards.
 */
import path from 'node:path';
import { loadConfig } from '../server/config';
import { RestoreError, restoreInstallation } from '../server/backup/restore';

const dir = process.argv[2];
if (!dir) {
  console.error('usage: npm run restore -- DIR   (DIR: a folder written by npm run backup)');
  process.exit(2);
}
const config = loadConfig();
if (config.databaseUrl || config.s3) {
  console.error(
    `npm run restore copies a one-machine installation (SQLite file and media folder). With DATABASE_URL or S3_BUCKET set, use the engines' own tools: pg_dump / pg_restore for the database and the object store's replication or versioning for the bucket.`,
  );
  process.exit(2);
}
try {
  await restoreInstallation({
    dir: path.resolve(dir),
    dbFile: config.dbFile,
    uploadsDir: config.uploadsDir,
    progress: (line) => console.log(line),
  });
} catch (err) {
  if (!(err instanceof RestoreError)) throw err;
  console.error(`restore refused: ${err.message}`);
  process.exit(1);
}
