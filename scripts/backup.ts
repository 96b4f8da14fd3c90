/**
 * `npm run backup -- DIR`: a consistent backup of the installation named by `DB_FILE` and
 * `UPLOADS_DIR` into the new or empty folder DIR, while the server runs (server/backup/backup.ts).
 */
import path from 'node:path';
import { loadConfig } from '../server/config';
import { BackupError, backupInstallation } from '../server/backup/backup';
import { localMediaStore } from '../server/storage/local-media-store';

const dir = process.argv[2];
if (!dir) {
  console.error('usage: npm run backup -- DIR   (DIR: a new or empty folder)');
  process.exit(2);
}
const config = loadConfig();
if (config.databaseUrl || config.s3) {
  console.error(
    `npm run backup copies a one-machine installation (SQLite file and media folder). With DATABASE_URL or S3_BUCKET set, use the engines' own tools: pg_dump / pg_restore for the database and the object store's replication or versioning for the bucket.`,
  );
  process.exit(2);
}
try {
  await backupInstallation({
    dbFile: config.dbFile,
    store: localMediaStore(config.uploadsDir),
    dir: path.resolve(dir),
    progress: (line) => console.log(line),
  });
} catch (err) {
  if (!(err instanceof BackupError)) throw err;
  console.error(`backup refused: ${err.message}`);
  process.exit(1);
}
