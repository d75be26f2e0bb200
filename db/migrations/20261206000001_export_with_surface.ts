// An export of guides may carry the growth surface beside them (USD Mesh prim, glTF mesh, OBJ
// object), so a pipeline can bind the guides from the file alone; asked for per export.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('groom_exports', (table) => {
    table.boolean('with_surface').notNullable().defaultTo(false);
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('groom_exports', (table) => {
    table.dropColumn('with_surface');
  });
}
