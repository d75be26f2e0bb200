// A groom moved onto a sculpt pass of its surface (same polygons, moved vertices) keeps growing its
// guides from the roots sampled on the surface they were first grown on, so every guide keeps its
// id, polygon and weights (lib/groom/grow/binding.ts, rootsOnSculpt). Versions remember it too.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  for (const table of ['grooms', 'groom_versions']) {
    await knex.schema.alterTable(table, (t) => {
      t.uuid('roots_surface_id').references('id').inTable('growth_surfaces').onDelete('SET NULL');
    });
  }
}

export async function down(knex: Knex) {
  for (const table of ['grooms', 'groom_versions']) {
    await knex.schema.alterTable(table, (t) => {
      t.dropColumn('roots_surface_id');
    });
  }
}
