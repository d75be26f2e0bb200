// What a listing is (lib/market/listing-facts.ts), stored when its assets are built: `facts` for
// the page and the API, and the two numbers the search filters on in columns of their own —
// guides per cm² of the area they grow on and the median guide length in cm — which mean the same
// on any character, unlike the guide count (which follows the size of the seller's mesh) whose
// filter they replace. Listings built before this have no facts until the asset job rebuilds
// them: the job workers queue them when they start (lib/market/workers.ts).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('listings', (table) => {
    table.jsonb('facts');
    table.double('guides_per_cm2');
    table.double('typical_length_cm');
  });
  await knex.raw('DROP INDEX IF EXISTS listings_published_guides');
  await knex.raw(`CREATE INDEX listings_published_density ON listings (guides_per_cm2) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_published_length ON listings (typical_length_cm) WHERE state = 'published'`);
}

export async function down(knex: Knex) {
  await knex.raw('DROP INDEX IF EXISTS listings_published_density');
  await knex.raw('DROP INDEX IF EXISTS listings_published_length');
  await knex.raw(`CREATE INDEX listings_published_guides ON listings (guide_count) WHERE state = 'published'`);
  await knex.schema.alterTable('listings', (table) => {
    table.dropColumns('facts', 'guides_per_cm2', 'typical_length_cm');
  });
}
