// Growth surfaces are checked by a job, not inside the registration request: a surface row exists
// from registration on, with a state (checking → ready, or refused with the problems found), the
// check's stage and progress for the studio's list, and the facts only once ready. The starting
// spec of a new groom is worked out by the check, so creating a groom never reads the file again.
import type { Knex } from 'knex';

const FACTS = ['vertex_count', 'face_count', 'component_count', 'boundary_loop_count', 'genus', 'euler_characteristic', 'area_cm2', 'components'];

export async function up(knex: Knex) {
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.text('state').notNullable().defaultTo('ready');
    table.text('check_stage').notNullable().defaultTo('checked');
    table.float('check_progress').notNullable().defaultTo(1);
    /** The problems of a refused surface (lib/field's Problem, errors first). */
    table.jsonb('problems').notNullable().defaultTo('[]');
    /** The spec a new groom on this surface starts from (null on surfaces checked before this column). */
    table.jsonb('starting_spec');
  });
  for (const column of FACTS) await knex.raw(`ALTER TABLE growth_surfaces ALTER COLUMN ${column} DROP NOT NULL`);
  await knex.raw(`ALTER TABLE growth_surfaces ADD CONSTRAINT growth_surfaces_known_state CHECK (state IN ('checking', 'ready', 'refused'))`);
  // A ready surface has its facts; the others may not.
  await knex.raw(`ALTER TABLE growth_surfaces ADD CONSTRAINT growth_surfaces_ready_has_facts CHECK (state <> 'ready' OR (face_count IS NOT NULL AND area_cm2 IS NOT NULL AND components IS NOT NULL))`);
}

export async function down(knex: Knex) {
  await knex('growth_surfaces').whereNot({ state: 'ready' }).delete();
  await knex.raw('ALTER TABLE growth_surfaces DROP CONSTRAINT growth_surfaces_ready_has_facts');
  await knex.raw('ALTER TABLE growth_surfaces DROP CONSTRAINT growth_surfaces_known_state');
  for (const column of FACTS) await knex.raw(`ALTER TABLE growth_surfaces ALTER COLUMN ${column} SET NOT NULL`);
  await knex.schema.alterTable('growth_surfaces', (table) => {
    table.dropColumns('state', 'check_stage', 'check_progress', 'problems', 'starting_spec');
  });
}
