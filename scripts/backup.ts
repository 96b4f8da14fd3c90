/**
 * `npm run backup -- DIR`: a consistent backup of the installation named by `DB_FILE` and
 * `UPLOADS_DIR` into the new or empty folder DIR, while the server runs (server/backup/backup.ts).
 */
import { BackupError, backupInstallation } from '../server/backup/backup';
import { localMediaStore } from '../server/storage/local-media-store';
import { runInstallationCommand } from './installation-command';

await runInstallationCommand({
  name: 'backup',
  dirMeans: 'a new or empty folder',
  refusal: BackupError,
  run: (config, dir, progress) => backupInstallation({ dbFile: config.dbFile, store: localMediaStore(config.uploadsDir), dir, progress }),
});
