import type { Knex } from 'knex';

// Sharpness, field of view and display colour (docs/method.md §5.10–5.12): capture sets may show the
// slanted-edge pattern, and a camera profile may keep the angle one of its pixels subtends, measured
// on a target of known angle (the field of view then comes from it instead of the EXIF focal length).
// The display's resolution and white point live in the stack's JSON and need no column.
export async function up(knex: Knex): Promise<void> {
  // knex's enu() made a CHECK constraint named <table>_<column>_check
  await knex.raw('ALTER TABLE capture_sets DROP CONSTRAINT IF EXISTS capture_sets_pattern_check');
  await knex.raw(`ALTER TABLE capture_sets ADD CONSTRAINT capture_sets_pattern_check CHECK (pattern IN ('full', 'checkerboard', 'slanted-edge'))`);
  await knex.schema.alterTable('camera_profiles', (t) => {
    t.double('degrees_per_pixel');
  });
  // the bounds of lib/photometry/geometry.ts (DEGREES_PER_PIXEL_BOUNDS): a fisheye to a long telephoto
  await knex.raw('ALTER TABLE camera_profiles ADD CONSTRAINT camera_profiles_degrees_per_pixel_range CHECK (degrees_per_pixel IS NULL OR (degrees_per_pixel >= 0.0001 AND degrees_per_pixel <= 0.5))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE camera_profiles DROP CONSTRAINT IF EXISTS camera_profiles_degrees_per_pixel_range');
  await knex.schema.alterTable('camera_profiles', (t) => {
    t.dropColumn('degrees_per_pixel');
  });
  // slanted-edge sets cannot stay under the old constraint: they fall back to the default pattern
  await knex.raw(`UPDATE capture_sets SET pattern = 'full' WHERE pattern = 'slanted-edge'`);
  await knex.raw('ALTER TABLE capture_sets DROP CONSTRAINT IF EXISTS capture_sets_pattern_check');
  await knex.raw(`ALTER TABLE capture_sets ADD CONSTRAINT capture_sets_pattern_check CHECK (pattern IN ('full', 'checkerboard'))`);
}
