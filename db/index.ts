import knexFactory, { type Knex } from 'knex';
import { getEnv } from '../lib/env';

// The only Knex instance. Kept on globalThis so hot reload in development does not leak pools.
const g = globalThis as unknown as { __veilmeterDb?: Knex };

export function getDb(): Knex {
  if (!g.__veilmeterDb) {
    g.__veilmeterDb = knexFactory({
      client: 'pg',
      connection: getEnv().DATABASE_URL,
      pool: { min: 0, max: 10 },
      acquireConnectionTimeout: 10_000,
    });
  }
  return g.__veilmeterDb;
}

export async function closeDb(): Promise<void> {
  if (g.__veilmeterDb) {
    await g.__veilmeterDb.destroy();
    g.__veilmeterDb = undefined;
  }
}
