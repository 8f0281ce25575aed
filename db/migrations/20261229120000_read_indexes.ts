import type { Knex } from 'knex';

// The read cache fingerprints a project's data on every request (count, newest and summed
// updated_at): these let that be an index-only scan instead of reading every row.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('CREATE INDEX IF NOT EXISTS readings_project_lab_updated ON readings (project_id, lab_id, updated_at)');
  await knex.raw('CREATE INDEX IF NOT EXISTS capture_sets_revision_lab_updated ON capture_sets (revision_id, lab_id, updated_at)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS capture_sets_revision_lab_updated');
  await knex.raw('DROP INDEX IF EXISTS readings_project_lab_updated');
}
