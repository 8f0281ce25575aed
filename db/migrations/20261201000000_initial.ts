import type { Knex } from 'knex';

const ROLES = ['admin', 'lead', 'tester', 'viewer'];
const PHOTO_ROLES = ['on', 'off', 'ambient', 'dark'];
const REGION_KINDS = ['screen', 'background', 'ghost'];
const ANALYSIS_STATUSES = ['queued', 'running', 'done', 'failed'];

export async function up(knex: Knex): Promise<void> {
  const id = (t: Knex.CreateTableBuilder) => t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
  const stamps = (t: Knex.CreateTableBuilder) => {
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  };
  const labRef = (t: Knex.CreateTableBuilder) => t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');

  await knex.schema.createTable('users', (t) => {
    id(t);
    t.text('email').notNullable();
    t.text('name').notNullable();
    t.text('password_hash').notNullable();
    stamps(t);
  });
  await knex.raw('CREATE UNIQUE INDEX users_email_unique ON users (lower(email))');

  await knex.schema.createTable('labs', (t) => {
    id(t);
    t.text('name').notNullable();
    stamps(t);
  });

  await knex.schema.createTable('memberships', (t) => {
    labRef(t);
    t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.enu('role', ROLES).notNullable();
    stamps(t);
    t.primary(['lab_id', 'user_id']);
    t.index(['user_id']);
  });

  await knex.schema.createTable('invitations', (t) => {
    id(t);
    labRef(t);
    t.text('email').notNullable();
    t.enu('role', ROLES).notNullable();
    t.text('token_hash').notNullable().unique();
    t.uuid('invited_by').references('users.id').onDelete('SET NULL');
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('accepted_at', { useTz: true });
    t.timestamp('revoked_at', { useTz: true });
    stamps(t);
    t.index(['lab_id', 'created_at']);
  });

  await knex.schema.createTable('password_resets', (t) => {
    id(t);
    t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.text('token_hash').notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    stamps(t);
  });

  await knex.schema.createTable('api_tokens', (t) => {
    id(t);
    labRef(t);
    t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.text('name').notNullable();
    t.text('prefix').notNullable();
    t.text('token_hash').notNullable().unique();
    t.specificType('scopes', 'text[]').notNullable().defaultTo('{}');
    t.timestamp('last_used_at', { useTz: true });
    t.timestamp('revoked_at', { useTz: true });
    stamps(t);
    t.index(['lab_id']);
  });

  await knex.schema.createTable('projects', (t) => {
    id(t);
    labRef(t);
    t.text('name').notNullable();
    t.text('description').notNullable().defaultTo('');
    stamps(t);
    t.unique(['lab_id', 'name']);
  });

  await knex.schema.createTable('targets', (t) => {
    id(t);
    labRef(t);
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('metric').notNullable();
    t.enu('comparator', ['>=', '<=']).notNullable();
    t.double('value').notNullable();
    t.text('condition_note').notNullable().defaultTo('');
    t.boolean('is_default').notNullable().defaultTo(false);
    stamps(t);
    t.index(['project_id']);
  });

  await knex.schema.createTable('revisions', (t) => {
    id(t);
    labRef(t);
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('label').notNullable();
    t.integer('position').notNullable();
    t.date('built_on');
    t.text('notes').notNullable().defaultTo('');
    t.enu('status', ['planned', 'built', 'measured', 'retired']).notNullable().defaultTo('planned');
    t.jsonb('stack').notNullable().defaultTo(knex.raw(`'{"elements":[]}'::jsonb`));
    stamps(t);
    t.unique(['project_id', 'label']);
    t.index(['project_id', 'position']);
  });

  await knex.schema.createTable('capture_sets', (t) => {
    id(t);
    labRef(t);
    t.uuid('revision_id').notNullable().references('revisions.id').onDelete('CASCADE');
    t.text('label').notNullable();
    t.text('variant').notNullable().defaultTo('');
    t.enu('pattern', ['full', 'checkerboard']).notNullable().defaultTo('full');
    t.jsonb('conditions').notNullable().defaultTo('{}');
    t.text('notes').notNullable().defaultTo('');
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    stamps(t);
    t.index(['revision_id', 'variant']);
  });

  await knex.schema.createTable('photos', (t) => {
    id(t);
    labRef(t);
    t.uuid('capture_set_id').notNullable().references('capture_sets.id').onDelete('CASCADE');
    t.enu('role', PHOTO_ROLES).notNullable();
    t.text('storage_key').notNullable();
    t.text('preview_key');
    t.specificType('sha256', 'char(64)').notNullable();
    t.bigInteger('bytes').notNullable();
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.text('format').notNullable();
    t.integer('bit_depth').notNullable().defaultTo(8);
    t.jsonb('exif').notNullable().defaultTo('{}');
    t.text('original_name').notNullable().defaultTo('');
    stamps(t);
    t.unique(['lab_id', 'sha256']);
    t.index(['capture_set_id', 'role']);
  });

  await knex.schema.createTable('regions', (t) => {
    id(t);
    labRef(t);
    t.uuid('capture_set_id').notNullable().references('capture_sets.id').onDelete('CASCADE');
    t.enu('kind', REGION_KINDS).notNullable();
    t.integer('x').notNullable();
    t.integer('y').notNullable();
    t.integer('w').notNullable();
    t.integer('h').notNullable();
    t.enu('source', ['marked', 'detected', 'template']).notNullable().defaultTo('marked');
    stamps(t);
    t.unique(['capture_set_id', 'kind']);
  });
  await knex.raw('ALTER TABLE regions ADD CONSTRAINT regions_positive CHECK (x >= 0 AND y >= 0 AND w > 0 AND h > 0)');

  await knex.schema.createTable('region_templates', (t) => {
    id(t);
    labRef(t);
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('name').notNullable();
    t.integer('image_width').notNullable();
    t.integer('image_height').notNullable();
    t.jsonb('regions').notNullable();
    stamps(t);
    t.unique(['project_id', 'name']);
  });

  await knex.schema.createTable('analyses', (t) => {
    id(t);
    labRef(t);
    t.uuid('capture_set_id').notNullable().references('capture_sets.id').onDelete('CASCADE');
    t.enu('status', ANALYSIS_STATUSES).notNullable().defaultTo('queued');
    t.text('engine_version');
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('progress').notNullable().defaultTo(0);
    t.text('stage').notNullable().defaultTo('queued');
    t.text('error');
    t.uuid('requested_by').references('users.id').onDelete('SET NULL');
    t.timestamp('queued_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('started_at', { useTz: true });
    t.timestamp('finished_at', { useTz: true });
    stamps(t);
    t.index(['capture_set_id', 'created_at']);
    t.index(['status', 'queued_at']);
  });

  await knex.schema.createTable('readings', (t) => {
    id(t);
    labRef(t);
    t.uuid('analysis_id').notNullable().unique().references('analyses.id').onDelete('CASCADE');
    t.uuid('capture_set_id').notNullable().references('capture_sets.id').onDelete('CASCADE');
    t.uuid('revision_id').notNullable().references('revisions.id').onDelete('CASCADE');
    t.uuid('project_id').notNullable().references('projects.id').onDelete('CASCADE');
    t.text('variant').notNullable().defaultTo('');
    t.text('engine_version').notNullable();
    t.double('ambient_contrast_ratio');
    t.double('michelson');
    t.double('ansi_contrast');
    t.double('uniformity');
    t.double('ghost_ratio');
    t.double('transmission');
    t.double('tint_delta_e00');
    t.double('tint_dx');
    t.double('tint_dy');
    t.double('luminance_on');
    t.double('luminance_off');
    t.double('luminance_ambient');
    t.double('luminance_on_cdm2');
    t.double('background_cdm2');
    t.double('clipped_fraction');
    t.integer('warning_count').notNullable().defaultTo(0);
    t.jsonb('result').notNullable();
    t.jsonb('artifacts').notNullable().defaultTo('{}');
    stamps(t);
    t.index(['project_id', 'revision_id', 'created_at']);
    t.index(['capture_set_id', 'created_at']);
  });

  await knex.schema.createTable('audit_events', (t) => {
    t.bigIncrements('id');
    t.uuid('lab_id').references('labs.id').onDelete('CASCADE');
    t.uuid('user_id').references('users.id').onDelete('SET NULL');
    t.text('action').notNullable();
    t.text('target_type');
    t.text('target_id');
    t.jsonb('details').notNullable().defaultTo('{}');
    t.text('ip');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['lab_id', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['audit_events', 'readings', 'analyses', 'region_templates', 'regions', 'photos', 'capture_sets',
    'revisions', 'targets', 'projects', 'api_tokens', 'password_resets', 'invitations', 'memberships', 'labs', 'users']) {
    await knex.schema.dropTableIfExists(table);
  }
}
