import type { Knex } from 'knex';

// Accounts prove their address before they act in a lab, and sessions can be ended.
// - users.email_verified_at: when the address was proved (a verification link, a reset link or an
//   invitation link opened). Accounts that existed before this migration count as verified from
//   their creation: they were made by the seed, by an invitation link, or by a sign-up that an
//   operator can send back to verification with `UPDATE users SET email_verified_at = NULL`.
// - users.session_version: copied into every session token at sign-in; a token whose copy differs
//   from the row is no session. Sign-out, a password reset and removal from the last lab raise it.
// - email_verifications: one-time links (only their hash is kept), as password_resets.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.timestamp('email_verified_at', { useTz: true }).nullable();
    t.integer('session_version').notNullable().defaultTo(0);
  });
  await knex.raw('UPDATE users SET email_verified_at = created_at');
  await knex.schema.createTable('email_verifications', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('user_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    t.text('token_hash').notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true }).nullable();
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['user_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('email_verifications');
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('session_version');
    t.dropColumn('email_verified_at');
  });
}
