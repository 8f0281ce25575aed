import type { Knex } from 'knex';

// Capture sets may show the orientation marker: the engine then reads how the optics turned or
// mirrored the image (docs/method.md §5.13), which the planner sets beside its predicted handedness.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE capture_sets DROP CONSTRAINT IF EXISTS capture_sets_pattern_check');
  await knex.raw(`ALTER TABLE capture_sets ADD CONSTRAINT capture_sets_pattern_check CHECK (pattern IN ('full', 'checkerboard', 'slanted-edge', 'orientation'))`);
}

export async function down(knex: Knex): Promise<void> {
  // orientation sets cannot stay under the old constraint: they fall back to the default pattern
  await knex.raw(`UPDATE capture_sets SET pattern = 'full' WHERE pattern = 'orientation'`);
  await knex.raw('ALTER TABLE capture_sets DROP CONSTRAINT IF EXISTS capture_sets_pattern_check');
  await knex.raw(`ALTER TABLE capture_sets ADD CONSTRAINT capture_sets_pattern_check CHECK (pattern IN ('full', 'checkerboard', 'slanted-edge'))`);
}
