import type { Knex } from 'knex';

// The read cache once fingerprinted a project by counting and summing updated_at over its rows;
// migration 20270105090000 replaced that with a data version on the project row. These two indexes
// served only the old fingerprint (each of their leading columns has an index of its own), so they
// now cost every write and help no read.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS readings_project_lab_updated');
  await knex.raw('DROP INDEX IF EXISTS capture_sets_revision_lab_updated');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('CREATE INDEX IF NOT EXISTS readings_project_lab_updated ON readings (project_id, lab_id, updated_at)');
  await knex.raw('CREATE INDEX IF NOT EXISTS capture_sets_revision_lab_updated ON capture_sets (revision_id, lab_id, updated_at)');
}
