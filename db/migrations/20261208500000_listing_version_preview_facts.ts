// A listing update waiting for review keeps its own reduced public preview and its measured facts
// (as listings do since 20261208200000/20261208200001), so approving it puts them on the listing
// with its pictures and package.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('listing_versions', (table) => {
    table.text('preview_key');
    table.jsonb('facts');
    table.double('guides_per_cm2');
    table.double('typical_length_cm');
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('listing_versions', (table) => {
    table.dropColumns('preview_key', 'facts', 'guides_per_cm2', 'typical_length_cm');
  });
}
