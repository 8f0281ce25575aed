// Runs knex migrations: `tsx db/migrate.ts latest|rollback|down-all|status`.
import { closeDb, getDb } from './index';
import { migrationConfig as migrations } from './migration-source';

async function main(cmd: string): Promise<void> {
  const db = getDb();
  if (cmd === 'latest') {
    const [, done] = await db.migrate.latest(migrations);
    console.log(done.length ? `migrated: ${done.join(', ')}` : 'database is up to date');
  } else if (cmd === 'rollback') {
    const [, done] = await db.migrate.rollback(migrations);
    console.log(`rolled back: ${done.join(', ') || 'nothing'}`);
  } else if (cmd === 'down-all') {
    const [, done] = await db.migrate.rollback(migrations, true);
    console.log(`rolled back: ${done.join(', ') || 'nothing'}`);
  } else if (cmd === 'status') {
    const [done, pending] = await db.migrate.list(migrations);
    console.log(`applied ${done.length}, pending ${pending.length}`);
  } else {
    throw new Error(`unknown command "${cmd}" (latest, rollback, down-all, status)`);
  }
}

main(process.argv[2] ?? 'latest')
  .catch((err: unknown) => {
    console.error(err instanceof Error ? err.message : err);
    process.exitCode = 1;
  })
  .finally(() => closeDb());
