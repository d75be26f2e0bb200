// A checked surface's prepared form (lib/field's writePreparedSurface), written by the check job
// beside the uploaded file, so that the editor copies arrays instead of parsing and welding the
// file. Null for surfaces checked before it (the editor reads their file) and when writing it failed.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.text('prepared_key');
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.dropColumn('prepared_key');
  });
}
