import { loadConfig } from '../server/config';
import { createDb, dbTarget, migrate } from '../server/db/knex';
import { seed } from '../seeds/demo-scenario';

const db = createDb(dbTarget(loadConfig()));
await migrate(db);
console.log((await seed(db)) ? 'Demo scenario seeded.' : 'A clinic exists already; nothing seeded.');
await db.destroy();
