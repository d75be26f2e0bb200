// Whether a surface's file had UVs on every corner, and how much of its UV map is used twice
// (lib/field's uvFacts): a groom bound by UV, or carried to another surface by UV, needs both.
// Null on surfaces checked before these columns (their files were read without UVs).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.boolean('has_uvs');
    table.float('uv_overlap_fraction');
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.dropColumns('has_uvs', 'uv_overlap_fraction');
  });
}
