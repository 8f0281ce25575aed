import type { Knex } from 'knex';
import { migrationSource } from './db/migration-source';
import { getEnv } from './lib/env';

// Used by the knex CLI (NODE_OPTIONS="--import tsx") and by db/migrate.ts; the app uses db/index.ts.
const config: Knex.Config = {
  client: 'pg',
  connection: getEnv().DATABASE_URL,
  migrations: { migrationSource },
  pool: { min: 0, max: 4 },
};

export default config;
