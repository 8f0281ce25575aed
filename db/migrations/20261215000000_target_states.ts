import type { Knex } from 'knex';

// The last known pass/fail of each target on each revision: a lead is mailed when a revision
// turns to failing, not on every reading that keeps it failing.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('target_states', (t) => {
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.uuid('target_id').notNullable().references('targets.id').onDelete('CASCADE');
    t.uuid('revision_id').notNullable().references('revisions.id').onDelete('CASCADE');
    t.boolean('failing').notNullable();
    t.timestamp('changed_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['target_id', 'revision_id']);
    t.index(['revision_id']);
  });
  await knex.schema.alterTable('targets', (t) => {
    t.index(['lab_id', 'project_id']);
  });
  // trends and comparisons read the newest reading of each capture set of one project
  await knex.raw('CREATE INDEX readings_project_set_newest ON readings (project_id, capture_set_id, created_at DESC)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS readings_project_set_newest');
  await knex.schema.alterTable('targets', (t) => {
    t.dropIndex(['lab_id', 'project_id']);
  });
  await knex.schema.dropTableIfExists('target_states');
}
