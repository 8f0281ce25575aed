import type { Knex } from 'knex';

// One calibration per camera body and lab, found again by the make and model in a photo's EXIF.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('camera_profiles', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.text('make').notNullable();
    t.text('model').notNullable();
    t.text('name').notNullable();
    // cd/m² per unit of Y·N²/(t·S)
    t.double('k').notNullable();
    // patch rectangle, meter reading in cd/m², photo exposure and patch level: enough to re-derive k
    t.jsonb('calibration').notNullable().defaultTo('{}');
    // the latest grey-steps check, so the list can say whether this camera's JPEGs are fit for photometry
    t.jsonb('linearity');
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['lab_id', 'make', 'model']);
  });
  await knex.raw('ALTER TABLE camera_profiles ADD CONSTRAINT camera_profiles_k_positive CHECK (k > 0)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('camera_profiles');
}
