// listings.assets_prefix said where an approved version's pictures and preview lived; the listing
// now names its preview (preview_key) and pictures by their keys, so nothing reads it any more.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('listings', (table) => {
    table.dropColumn('assets_prefix');
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('listings', (table) => {
    table.text('assets_prefix');
  });
}
