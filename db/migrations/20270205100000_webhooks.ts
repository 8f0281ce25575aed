import type { Knex } from 'knex';

// Signed webhooks: a lab admin registers a URL; finished analyses and target state changes put a
// delivery row per subscribed webhook in the same transaction (triggers, so no writer can forget),
// and the worker posts each one with retries (lib/webhooks).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('webhooks', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.text('url').notNullable();
    // the HMAC key the receiver checks signatures with; shown once when the webhook is made
    t.text('secret').notNullable();
    t.specificType('events', 'text[]').notNullable();
    t.uuid('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['lab_id']);
  });
  await knex.schema.createTable('webhook_deliveries', (t) => {
    t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    t.uuid('lab_id').notNullable().references('labs.id').onDelete('CASCADE');
    t.uuid('webhook_id').notNullable().references('webhooks.id').onDelete('CASCADE');
    t.text('event').notNullable();
    t.jsonb('payload').notNullable();
    t.text('status').notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('last_status');
    t.text('last_error');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('delivered_at', { useTz: true });
    t.index(['status', 'created_at']);
    t.index(['webhook_id', 'created_at']);
  });
  await knex.raw(`ALTER TABLE webhook_deliveries ADD CONSTRAINT webhook_deliveries_status CHECK (status IN ('pending', 'delivered', 'failed'))`);

  // at commit (deferred), so the reading saved in the same transaction as "done" is there to name
  await knex.raw(`
    CREATE FUNCTION vm_webhook_analysis() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.status IN ('done', 'failed') AND (TG_OP = 'INSERT' OR OLD.status IS DISTINCT FROM NEW.status) THEN
        INSERT INTO webhook_deliveries (lab_id, webhook_id, event, payload)
        SELECT w.lab_id, w.id, 'analysis.' || NEW.status, jsonb_build_object(
            'analysisId', NEW.id, 'captureSetId', NEW.capture_set_id, 'status', NEW.status, 'error', NEW.error,
            'engineVersion', NEW.engine_version, 'finishedAt', NEW.finished_at,
            'revisionId', c.revision_id, 'projectId', r.project_id,
            'readingId', g.id, 'ambientContrastRatio', g.ambient_contrast_ratio)
        FROM webhooks w
        JOIN capture_sets c ON c.id = NEW.capture_set_id
        JOIN revisions r ON r.id = c.revision_id
        LEFT JOIN LATERAL (SELECT id, ambient_contrast_ratio FROM readings WHERE analysis_id = NEW.id ORDER BY created_at DESC LIMIT 1) g ON true
        WHERE w.lab_id = NEW.lab_id AND ('analysis.' || NEW.status) = ANY (w.events);
      END IF;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE CONSTRAINT TRIGGER vm_webhook_analysis AFTER INSERT OR UPDATE OF status ON analyses DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION vm_webhook_analysis()`);

  await knex.raw(`
    CREATE FUNCTION vm_webhook_target() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'INSERT' OR OLD.failing IS DISTINCT FROM NEW.failing THEN
        INSERT INTO webhook_deliveries (lab_id, webhook_id, event, payload)
        SELECT w.lab_id, w.id, 'target.changed', jsonb_build_object(
            'targetId', NEW.target_id, 'revisionId', NEW.revision_id, 'variant', NEW.variant, 'failing', NEW.failing,
            'wasFailing', CASE WHEN TG_OP = 'UPDATE' THEN to_jsonb(OLD.failing) ELSE 'null'::jsonb END,
            'metric', t.metric, 'comparator', t.comparator, 'value', t.value, 'projectId', t.project_id)
        FROM webhooks w JOIN targets t ON t.id = NEW.target_id
        WHERE w.lab_id = NEW.lab_id AND 'target.changed' = ANY (w.events);
      END IF;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER vm_webhook_target AFTER INSERT OR UPDATE OF failing ON target_states FOR EACH ROW EXECUTE FUNCTION vm_webhook_target()`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER IF EXISTS vm_webhook_target ON target_states');
  await knex.raw('DROP FUNCTION IF EXISTS vm_webhook_target()');
  await knex.raw('DROP TRIGGER IF EXISTS vm_webhook_analysis ON analyses');
  await knex.raw('DROP FUNCTION IF EXISTS vm_webhook_analysis()');
  await knex.schema.dropTableIfExists('webhook_deliveries');
  await knex.schema.dropTableIfExists('webhooks');
}
