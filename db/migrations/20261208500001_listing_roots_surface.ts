// A listing (and each listing version) sells a groom version as it is: a version of a groom moved
// onto a new sculpt grows its guides from roots sampled on the earlier sculpt (groom_versions.
// roots_surface_id), so the listing keeps a frozen copy of that surface too, and its package
// carries the same guide ids, root polygons and weights as the studio's export.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  for (const name of ['listings', 'listing_versions']) {
    await knex.schema.alterTable(name, (table) => {
      table.text('roots_surface_key');
      table.text('roots_surface_file_name');
    });
  }
}

export async function down(knex: Knex) {
  for (const name of ['listings', 'listing_versions']) {
    await knex.schema.alterTable(name, (table) => {
      table.dropColumns('roots_surface_key', 'roots_surface_file_name');
    });
  }
}
