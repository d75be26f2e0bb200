// A groom's surface can be replaced (its spec carried onto the new one), so each version keeps the
// surface it was made on: an earlier version opens on its own surface. Versions made before this
// migration were all made on their groom's present surface; a version inserted without a surface
// (code that predates this column) is made on its groom's present surface too, filled by a trigger.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('groom_versions', (table) => {
    table.uuid('surface_id').references('growth_surfaces.id').onDelete('RESTRICT');
  });
  await knex.raw('UPDATE groom_versions v SET surface_id = g.surface_id FROM grooms g WHERE g.id = v.groom_id');
  await knex.raw(`
    CREATE FUNCTION groom_version_surface() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.surface_id IS NULL THEN
        SELECT surface_id INTO NEW.surface_id FROM grooms WHERE id = NEW.groom_id;
      END IF;
      RETURN NEW;
    END $$`);
  await knex.raw('CREATE TRIGGER groom_version_surface BEFORE INSERT ON groom_versions FOR EACH ROW EXECUTE FUNCTION groom_version_surface()');
  await knex.raw('ALTER TABLE groom_versions ALTER COLUMN surface_id SET NOT NULL');
}

export async function down(knex: Knex) {
  await knex.raw('DROP TRIGGER groom_version_surface ON groom_versions');
  await knex.raw('DROP FUNCTION groom_version_surface()');
  await knex.schema.alterTable('groom_versions', (table) => {
    table.dropColumn('surface_id');
  });
}
