import { closeDb, getDb } from '../index';

// The database connection as a whole, for the health check and for processes that own the pool
// (the worker closes it on shutdown); everything else reaches PostgreSQL through a query module.

/** Resolves once PostgreSQL answers a trivial query; rejects when it cannot be reached. */
export async function pingDatabase(): Promise<void> {
  await getDb().raw('select 1');
}

/** Closes the pool (shutdown, the end of a script or a test). */
export const closeDatabase = closeDb;
