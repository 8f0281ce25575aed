import type { Knex } from 'knex';

// The rig API (/api/v1): stored answers for Idempotency-Key retries, and which token created a
// capture set, so a rig may delete the sets it made itself and no others.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('idempotency_keys', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    // 'token:<id>' or 'user:<id>': one caller's keys never answer another's
    t.text('caller').notNullable();
    t.text('key').notNullable();
    // method, path and query of the first request, and the SHA-256 of its body
    t.text('request').notNullable();
    t.specificType('body_hash', 'char(64)').notNullable();
    // null while the first request runs; then its answer
    t.integer('status');
    t.text('content_type');
    t.binary('body');
    t.timestamp('locked_until', { useTz: true }).notNullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.unique(['lab_id', 'caller', 'key']);
    t.index(['expires_at']);
  });
  await knex.schema.alterTable('capture_sets', (t) => {
    t.uuid('created_by_token').references('api_tokens.id').onDelete('SET NULL');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('capture_sets', (t) => {
    t.dropColumn('created_by_token');
  });
  await knex.schema.dropTableIfExists('idempotency_keys');
}
