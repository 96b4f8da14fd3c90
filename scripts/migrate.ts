import { loadConfig } from '../server/config';
import { createDb, dbTarget, migrate } from '../server/db/knex';

const db = createDb(dbTarget(loadConfig()));
const applied = await migrate(db);
console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'Database is up to date.');
await db.destroy();
