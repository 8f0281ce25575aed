import type { Knex } from 'knex';

// The readings of engine 1.2.0 (docs/method.md §5.8–5.12): the optics' own transmission and the veil
// (relative and in cd/m²), MTF50 per camera pixel and per degree, the display white's Δu′v′ from its
// reference and the colour uniformity, each a copy of the result's figure for trends, comparisons
// and targets; and the standard uncertainty of every figure that has one, keyed by metric.
const COLUMNS = ['transmission_optics', 'veil', 'veil_cdm2', 'mtf50', 'mtf50_per_degree', 'display_duv', 'colour_uniformity_duv'] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('readings', (t) => {
    for (const c of COLUMNS) t.double(c);
    t.jsonb('uncertainty').notNullable().defaultTo('{}');
  });
  // readings of 1.2.0 written before this column carry their uncertainty in the result
  await knex.raw(`UPDATE readings SET uncertainty = result->'uncertainty' WHERE jsonb_typeof(result->'uncertainty') = 'object'`);
  await knex.raw(`UPDATE readings SET transmission_optics = (result->>'transmissionOptics')::double precision WHERE jsonb_typeof(result->'transmissionOptics') = 'number'`);
  await knex.raw(`UPDATE readings SET veil = (result->'veil'->>'relative')::double precision, veil_cdm2 = CASE WHEN jsonb_typeof(result->'veil'->'cdm2') = 'number' THEN (result->'veil'->>'cdm2')::double precision END WHERE jsonb_typeof(result->'veil') = 'object'`);
}

export async function down(knex: Knex): Promise<void> {
  // targets on the new metrics mean nothing without their columns
  await knex('targets').whereIn('metric', ['transmissionOptics', 'veil', 'mtf50', 'mtf50PerDegree', 'displayDuv', 'colourUniformityDuv']).delete();
  await knex.schema.alterTable('readings', (t) => {
    t.dropColumn('uncertainty');
    for (const c of COLUMNS) t.dropColumn(c);
  });
}
