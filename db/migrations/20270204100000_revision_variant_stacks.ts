import type { Knex } from 'knex';

// A revision's stack per variant, each as a change to the base stack: the base elements it leaves
// out (by position) and the elements it adds, keyed by the variant's label.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('revisions', (t) => {
    t.jsonb('variant_stacks').notNullable().defaultTo('{}');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('revisions', (t) => {
    t.dropColumn('variant_stacks');
  });
}
