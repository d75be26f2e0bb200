// The studio: uploads in flight, growth surfaces with the facts their check measured, grooms
// with their saved spec and named versions, and exports made by background jobs.
import type { Knex } from 'knex';

const SURFACE_FORMATS = `('obj', 'ply', 'stl', 'gltf', 'glb')`;
const UNITS = `('mm', 'cm', 'm', 'in')`;
const EXPORT_FORMATS = `('usda', 'usda-bspline', 'gltf', 'glb', 'obj', 'json', 'ply')`;
const EXPORT_STATUSES = `('queued', 'running', 'done', 'failed')`;

export async function up(knex: Knex) {
  // A presigned upload handed out and not yet registered as a surface. Registering (or
  // rejecting) the file deletes the row; the object then belongs to the surface or is deleted.
  await knex.schema.createTable('surface_uploads', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('owner_id').notNullable().references('users.id').onDelete('CASCADE');
    table.text('file_name').notNullable();
    table.text('format').notNullable();
    table.bigInteger('byte_size').notNullable();
    table.text('object_key').notNullable().unique();
    table.timestamp('expires_at', { useTz: true }).notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['owner_id']);
  });
  await knex.raw(`ALTER TABLE surface_uploads ADD CONSTRAINT surface_uploads_known_format CHECK (format IN ${SURFACE_FORMATS})`);

  await knex.schema.createTable('growth_surfaces', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('owner_id').notNullable().references('users.id').onDelete('CASCADE');
    table.text('name').notNullable();
    table.text('file_name').notNullable();
    table.text('format').notNullable();
    table.text('units').notNullable();
    table.text('object_key').notNullable().unique();
    table.bigInteger('byte_size').notNullable();
    table.integer('vertex_count').notNullable();
    table.integer('face_count').notNullable();
    table.integer('component_count').notNullable();
    table.integer('boundary_loop_count').notNullable();
    table.integer('genus').notNullable();
    table.integer('euler_characteristic').notNullable();
    table.double('area_cm2').notNullable();
    /** OBJ group names, in file order. */
    table.jsonb('groups').notNullable().defaultTo('[]');
    /** Per connected piece: faces, vertices, edges, boundary loops, χ, genus (lib/field's ComponentFacts). */
    table.jsonb('components').notNullable();
    /** The check's problems of severity `warning` (lib/field's Problem). */
    table.jsonb('warnings').notNullable().defaultTo('[]');
    table.text('thumbnail_key');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['owner_id', 'created_at']);
  });
  await knex.raw(`ALTER TABLE growth_surfaces ADD CONSTRAINT growth_surfaces_known_format CHECK (format IN ${SURFACE_FORMATS})`);
  await knex.raw(`ALTER TABLE growth_surfaces ADD CONSTRAINT growth_surfaces_known_units CHECK (units IN ${UNITS})`);

  await knex.schema.createTable('grooms', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('owner_id').notNullable().references('users.id').onDelete('CASCADE');
    // A surface cannot be deleted while a groom grows on it.
    table.uuid('surface_id').notNullable().references('growth_surfaces.id').onDelete('RESTRICT');
    table.text('name').notNullable();
    /** The saved spec, resolved by lib/groom (every default filled in). */
    table.jsonb('spec').notNullable();
    /** Bumped by every save of the spec, for the optimistic check of autosave. */
    table.integer('revision').notNullable().defaultTo(1);
    table.timestamp('spec_saved_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.text('thumbnail_key');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['owner_id', 'updated_at']);
    table.index(['surface_id']);
  });

  await knex.schema.createTable('groom_versions', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('groom_id').notNullable().references('grooms.id').onDelete('CASCADE');
    table.integer('number').notNullable();
    table.text('name').notNullable();
    table.jsonb('spec').notNullable();
    /** The groom's revision the version was copied from. */
    table.integer('source_revision').notNullable();
    table.text('thumbnail_key');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.unique(['groom_id', 'number']);
  });

  await knex.schema.createTable('groom_exports', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('groom_id').notNullable().references('grooms.id').onDelete('CASCADE');
    table.text('format').notNullable();
    table.text('status').notNullable().defaultTo('queued');
    table.double('progress').notNullable().defaultTo(0);
    table.text('stage').notNullable();
    table.text('error');
    /** The spec as saved when the export was asked for: the job makes the file from this copy. */
    table.jsonb('spec').notNullable();
    table.integer('spec_revision').notNullable();
    table.text('file_name').notNullable();
    table.text('object_key');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['groom_id', 'created_at']);
  });
  await knex.raw(`ALTER TABLE groom_exports ADD CONSTRAINT groom_exports_known_format CHECK (format IN ${EXPORT_FORMATS})`);
  await knex.raw(`ALTER TABLE groom_exports ADD CONSTRAINT groom_exports_known_status CHECK (status IN ${EXPORT_STATUSES})`);
  await knex.raw(`ALTER TABLE groom_exports ADD CONSTRAINT groom_exports_progress_fraction CHECK (progress >= 0 AND progress <= 1)`);
}

export async function down(knex: Knex) {
  await knex.schema.dropTable('groom_exports');
  await knex.schema.dropTable('groom_versions');
  await knex.schema.dropTable('grooms');
  await knex.schema.dropTable('growth_surfaces');
  await knex.schema.dropTable('surface_uploads');
}
