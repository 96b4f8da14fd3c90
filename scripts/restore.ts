/**
 * `npm run restore -- DIR`: restores the backup in DIR into the empty installation named by
 * `DB_FILE` and `UPLOADS_DIR` (server/backup/restore.ts). Start the server afterwards.
 */
import { RestoreError, restoreInstallation } from '../server/backup/restore';
import { runInstallationCommand } from './installation-command';

await runInstallationCommand({
  name: 'restore',
  dirMeans: 'a folder written by npm run backup',
  refusal: RestoreError,
  run: (config, dir, progress) => restoreInstallation({ dir, dbFile: config.dbFile, uploadsDir: config.uploadsDir, progress }),
});
