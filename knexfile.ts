import { loadConfig } from './server/config';
import { knexOptions, pgKnexOptions } from './server/db/knex';

/** For the knex CLI (`npx tsx node_modules/knex/bin/cli.js migrate:make name`); the app migrates itself. */
const config = loadConfig();
export default config.databaseUrl ? pgKnexOptions(config.databaseUrl) : knexOptions(config.dbFile);
