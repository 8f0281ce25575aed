import type { Knex } from 'knex';

// A project's cached trend and readings list are keyed by a number that every write to its
// readings, capture sets, revisions and targets moves on, inside the writing transaction. Reading
// it is one primary-key lookup, where counting and summing the rows on every request cost the
// database a scan per read.
const TABLES = ['readings', 'capture_sets', 'revisions', 'targets'] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE projects ADD COLUMN data_version bigint NOT NULL DEFAULT 0');
  await knex.raw(`
    CREATE FUNCTION vm_project_data_changed() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      -- capture sets name their project through their revision; the other tables name it
      IF TG_TABLE_NAME = 'capture_sets' THEN
        IF TG_OP = 'INSERT' THEN
          UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT r.project_id FROM revisions r WHERE r.id IN (SELECT revision_id FROM vm_new));
        ELSIF TG_OP = 'UPDATE' THEN
          UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT r.project_id FROM revisions r WHERE r.id IN (SELECT revision_id FROM vm_new UNION SELECT revision_id FROM vm_old));
        ELSE
          UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT r.project_id FROM revisions r WHERE r.id IN (SELECT revision_id FROM vm_old));
        END IF;
      ELSIF TG_OP = 'INSERT' THEN
        UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT project_id FROM vm_new);
      ELSIF TG_OP = 'UPDATE' THEN
        UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT project_id FROM vm_new UNION SELECT project_id FROM vm_old);
      ELSE
        UPDATE projects SET data_version = data_version + 1 WHERE id IN (SELECT project_id FROM vm_old);
      END IF;
      RETURN NULL;
    END $$`);
  for (const t of TABLES) {
    await knex.raw(`CREATE TRIGGER ${t}_data_insert AFTER INSERT ON ${t} REFERENCING NEW TABLE AS vm_new FOR EACH STATEMENT EXECUTE FUNCTION vm_project_data_changed()`);
    await knex.raw(`CREATE TRIGGER ${t}_data_update AFTER UPDATE ON ${t} REFERENCING NEW TABLE AS vm_new OLD TABLE AS vm_old FOR EACH STATEMENT EXECUTE FUNCTION vm_project_data_changed()`);
    await knex.raw(`CREATE TRIGGER ${t}_data_delete AFTER DELETE ON ${t} REFERENCING OLD TABLE AS vm_old FOR EACH STATEMENT EXECUTE FUNCTION vm_project_data_changed()`);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const t of TABLES) {
    for (const op of ['insert', 'update', 'delete']) await knex.raw(`DROP TRIGGER IF EXISTS ${t}_data_${op} ON ${t}`);
  }
  await knex.raw('DROP FUNCTION IF EXISTS vm_project_data_changed()');
  await knex.raw('ALTER TABLE projects DROP COLUMN IF EXISTS data_version');
}
