import type { Knex } from 'knex';

// One "re-analyse with the current engine" request over a revision or a whole project, and the
// analyses it queued, so its progress (n of m done) can be shown while the worker runs them. An item
// without an analysis is waiting for a place in the lab's queue (the lab's limit of analyses in flight).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('reanalysis_batches', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.uuid('revision_id').references('revisions.id').onDelete('CASCADE');
    t.text('engine_version').notNullable();
    t.uuid('requested_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['lab_id', 'project_id', 'created_at']);
  });
  await knex.schema.createTable('reanalysis_items', (t) => {
    t.uuid('batch_id').notNullable().references('reanalysis_batches.id').onDelete('CASCADE');
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.uuid('capture_set_id').notNullable().references('capture_sets.id').onDelete('CASCADE');
    t.uuid('analysis_id').references('analyses.id').onDelete('CASCADE');
    t.primary(['batch_id', 'capture_set_id']);
    t.index(['analysis_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('reanalysis_items');
  await knex.schema.dropTableIfExists('reanalysis_batches');
}
