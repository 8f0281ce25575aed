import type { Knex } from 'knex';

// When a capture set's photos last changed (one added, removed or replaced, or read with another
// encoding), kept by a trigger so every path that writes photos (the page, the rig API, the seed)
// records it. A reading whose analysis started before that time was made from other photos, and
// the capture page says so. A separate table rather than a column of capture_sets, so a photo
// change does not count as a change of the capture set itself.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE photo_changes (
      capture_set_id uuid PRIMARY KEY REFERENCES capture_sets(id) ON DELETE CASCADE,
      lab_id uuid NOT NULL REFERENCES labs(id) ON DELETE CASCADE,
      changed_at timestamptz NOT NULL
    )`);
  await knex.raw(`
    CREATE FUNCTION vm_photos_changed() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      set_id uuid;
    BEGIN
      IF TG_OP = 'UPDATE' AND NEW.storage_key IS NOT DISTINCT FROM OLD.storage_key AND NEW.encoding_declared IS NOT DISTINCT FROM OLD.encoding_declared
        AND NEW.role = OLD.role AND NEW.capture_set_id = OLD.capture_set_id THEN
        RETURN NULL;
      END IF;
      IF TG_OP = 'DELETE' THEN set_id := OLD.capture_set_id; ELSE set_id := NEW.capture_set_id; END IF;
      -- through capture_sets: a set being deleted (its photos go by cascade) records nothing
      INSERT INTO photo_changes (capture_set_id, lab_id, changed_at)
        SELECT c.id, c.lab_id, clock_timestamp() FROM capture_sets c WHERE c.id = set_id
        ON CONFLICT (capture_set_id) DO UPDATE SET changed_at = EXCLUDED.changed_at;
      RETURN NULL;
    END $$`);
  await knex.raw('CREATE TRIGGER photos_changed AFTER INSERT OR UPDATE OR DELETE ON photos FOR EACH ROW EXECUTE FUNCTION vm_photos_changed()');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER IF EXISTS photos_changed ON photos');
  await knex.raw('DROP FUNCTION IF EXISTS vm_photos_changed()');
  await knex.raw('DROP TABLE IF EXISTS photo_changes');
}
