// Moving a groom onto another surface is worked out by a job (two surfaces read and prepared, the
// spec carried over): the request that asks for it waits on this row, which the job fills with the
// carried spec and its report, or with why it could not be carried.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('groom_surface_moves', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('groom_id').notNullable().references('id').inTable('grooms').onDelete('CASCADE');
    table.uuid('target_surface_id').notNullable().references('id').inTable('growth_surfaces').onDelete('CASCADE');
    table.jsonb('input').notNullable();
    table.text('status').notNullable().defaultTo('queued');
    /** The groom's revision whose spec was carried. */
    table.integer('revision');
    table.jsonb('spec');
    table.jsonb('report');
    table.text('error');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw("ALTER TABLE groom_surface_moves ADD CONSTRAINT groom_surface_moves_status CHECK (status IN ('queued', 'running', 'done', 'failed'))");
}

export async function down(knex: Knex) {
  await knex.schema.dropTable('groom_surface_moves');
}
