import { loadConfig } from './server/config';
import { knexOptions } from './server/db/knex';

/** For the knex CLI (`npx tsx node_modules/knex/bin/cli.js migrate:make name`); the app migrates itself. */
export default knexOptions(loadConfig().dbFile);
