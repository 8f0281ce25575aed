import { readdirSync } from 'node:fs';
import type { Knex } from 'knex';

type Migration = { up: (knex: Knex) => Promise<void>; down: (knex: Knex) => Promise<void> };

const dir = new URL('./migrations/', import.meta.url);

/**
 * Lists db/migrations/*.ts and loads them with this module's own import(), so the migrations
 * run the same under tsx, vitest and the knex CLI (knex's loader cannot import .ts itself).
 */
export const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return readdirSync(dir).filter((f) => /^\d+_.*\.ts$/.test(f)).sort();
  },
  getMigrationName(name) {
    return name;
  },
  async getMigration(name) {
    return (await import(/* @vite-ignore */ new URL(name, dir).href)) as Migration;
  },
};

export const migrationConfig: Knex.MigratorConfig = { migrationSource };
