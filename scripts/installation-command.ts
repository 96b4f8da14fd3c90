/**
 * What `npm run backup` and `npm run restore` share: the folder argument, the refusal of an
 * installation on PostgreSQL or a bucket (those engines have their own tools), progress lines on
 * stdout, and a refusal as one line on stderr with exit code 1 (2 for a wrong call).
 */
import path from 'node:path';
import { loadConfig, type Config } from '../server/config';

export interface InstallationCommand {
  /** `backup` or `restore`: the npm script's name. */
  name: string;
  /** What DIR must be, for the usage line. */
  dirMeans: string;
  /** The error class whose message is a refusal to show (anything else is a bug and is thrown). */
  refusal: new (...args: never[]) => Error;
  /** Does the work for the folder DIR (absolute), saying progress through `progress`. */
  run: (config: Config, dir: string, progress: (line: string) => void) => Promise<unknown>;
}

/** Runs a backup or restore command line over `process.argv[2]`. */
export async function runInstallationCommand(c: InstallationCommand): Promise<void> {
  const dir = process.argv[2];
  if (!dir) {
    console.error(`usage: npm run ${c.name} -- DIR   (DIR: ${c.dirMeans})`);
    process.exit(2);
  }
  const config = loadConfig();
  if (config.databaseUrl || config.s3) {
    console.error(
      `npm run ${c.name} copies a one-machine installation (SQLite file and media folder). With DATABASE_URL or S3_BUCKET set, use the engines' own tools: pg_dump / pg_restore for the database and the object store's replication or versioning for the bucket.`,
    );
    process.exit(2);
  }
  try {
    await c.run(config, path.resolve(dir), (line) => console.log(line));
  } catch (err) {
    if (!(err instanceof c.refusal)) throw err;
    console.error(`${c.name} refused: ${err.message}`);
    process.exit(1);
  }
}
