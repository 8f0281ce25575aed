import type { Knex } from 'knex';

// Targets get a structured condition (ambient illuminance and background luminance ranges, the
// pattern) checked against each capture set's stated conditions, and the variants they are judged
// on; the free-text note stays as a note. Target states are kept per variant, since a target is
// judged on each variant of a revision on its own.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('targets', (t) => {
    t.jsonb('condition').notNullable().defaultTo('{}');
    t.jsonb('variants').notNullable().defaultTo('[]');
  });
  // a note that names the pattern becomes the structured pattern; the note itself is kept as it was
  await knex.raw(`UPDATE targets SET condition = jsonb_build_object('pattern', 'full') WHERE condition_note ~* 'full[- ]?white'`);
  await knex.raw(`UPDATE targets SET condition = jsonb_build_object('pattern', 'checkerboard') WHERE condition_note ~* 'checkerboard' AND condition = '{}'::jsonb`);
  await knex.schema.alterTable('target_states', (t) => {
    t.text('variant').notNullable().defaultTo('');
  });
  await knex.raw('ALTER TABLE target_states DROP CONSTRAINT target_states_pkey');
  await knex.raw('ALTER TABLE target_states ADD CONSTRAINT target_states_pkey PRIMARY KEY (target_id, revision_id, variant)');
}

export async function down(knex: Knex): Promise<void> {
  await knex('target_states').whereNot('variant', '').delete();
  await knex.raw('ALTER TABLE target_states DROP CONSTRAINT target_states_pkey');
  await knex.raw('ALTER TABLE target_states ADD CONSTRAINT target_states_pkey PRIMARY KEY (target_id, revision_id)');
  await knex.schema.alterTable('target_states', (t) => {
    t.dropColumn('variant');
  });
  await knex.schema.alterTable('targets', (t) => {
    t.dropColumn('variants');
    t.dropColumn('condition');
  });
}
