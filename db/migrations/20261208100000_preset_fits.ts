// A buyer's own use of a bought preset: a groom started from a purchase remembers it
// (grooms.from_purchase_id), so it is never offered for sale again (the licence covers use, not
// resale), and the transfer of a listing's frozen spec onto one of the buyer's surfaces is worked
// out by a job whose row the buyer reads: `fit` for a purchase (accepted into a groom), `trial`
// for a listing not yet bought (a reduced preview made for the trial, never the package's files).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('grooms', (table) => {
    // RESTRICT: a purchase row never goes while a groom made from it exists, so the mark cannot be lost.
    table.uuid('from_purchase_id').references('id').inTable('purchases').onDelete('RESTRICT');
  });
  await knex.schema.createTable('preset_transfers', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.text('kind').notNullable();
    table.uuid('buyer_id').notNullable().references('id').inTable('users').onDelete('CASCADE');
    table.uuid('listing_id').notNullable().references('id').inTable('listings').onDelete('CASCADE');
    table.uuid('purchase_id').references('id').inTable('purchases').onDelete('CASCADE');
    table.uuid('target_surface_id').notNullable().references('id').inTable('growth_surfaces').onDelete('CASCADE');
    table.text('status').notNullable().defaultTo('queued');
    /** What the job is doing now, in the buyer's words (the progress a page shows). */
    table.text('stage').notNullable().defaultTo('Waiting for a worker');
    table.jsonb('spec');
    table.jsonb('report');
    table.text('error');
    /** A trial's reduced preview (.glb) and pictures, under the buyer's trial prefix. */
    table.text('preview_key');
    table.jsonb('pictures');
    table.integer('preview_guide_count');
    table.integer('preview_points_per_guide');
    /** The groom an accepted fit made. */
    table.uuid('groom_id').references('id').inTable('grooms').onDelete('SET NULL');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['buyer_id', 'kind', 'created_at']);
  });
  await knex.raw("ALTER TABLE preset_transfers ADD CONSTRAINT preset_transfers_kind CHECK (kind IN ('fit', 'trial'))");
  await knex.raw("ALTER TABLE preset_transfers ADD CONSTRAINT preset_transfers_status CHECK (status IN ('queued', 'running', 'done', 'failed'))");
  await knex.raw("ALTER TABLE preset_transfers ADD CONSTRAINT preset_transfers_fit_purchase CHECK ((kind = 'fit') = (purchase_id IS NOT NULL))");
}

export async function down(knex: Knex) {
  await knex.schema.dropTable('preset_transfers');
  await knex.schema.alterTable('grooms', (table) => {
    table.dropColumn('from_purchase_id');
  });
}
