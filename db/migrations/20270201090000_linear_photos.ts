import type { Knex } from 'knex';

// How a 16-bit TIFF's values are read: sRGB-encoded (gamma) or linear light. A capture set says it
// for all its photos ('auto' lets each photo follow its file); a photo may say it for itself. The
// photo row keeps what its file said at upload (null for photos from before this migration, which
// were always read as sRGB) and how many pages a TIFF holds (the first is measured).
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE capture_sets ADD COLUMN tiff_encoding text NOT NULL DEFAULT 'auto' CONSTRAINT capture_sets_tiff_encoding CHECK (tiff_encoding IN ('auto', 'linear', 'srgb'))`);
  await knex.raw(`ALTER TABLE photos ADD COLUMN encoding_file text CONSTRAINT photos_encoding_file CHECK (encoding_file IN ('linear', 'srgb'))`);
  await knex.raw(`ALTER TABLE photos ADD COLUMN encoding_reason text NOT NULL DEFAULT ''`);
  await knex.raw(`ALTER TABLE photos ADD COLUMN encoding_declared text CONSTRAINT photos_encoding_declared CHECK (encoding_declared IN ('linear', 'srgb'))`);
  await knex.raw(`ALTER TABLE photos ADD COLUMN pages integer NOT NULL DEFAULT 1 CONSTRAINT photos_pages CHECK (pages >= 1)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE photos DROP COLUMN IF EXISTS pages');
  await knex.raw('ALTER TABLE photos DROP COLUMN IF EXISTS encoding_declared');
  await knex.raw('ALTER TABLE photos DROP COLUMN IF EXISTS encoding_reason');
  await knex.raw('ALTER TABLE photos DROP COLUMN IF EXISTS encoding_file');
  await knex.raw('ALTER TABLE capture_sets DROP COLUMN IF EXISTS tiff_encoding');
}
