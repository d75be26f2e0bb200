// Listing versions: a published listing can be improved after its first sale. Each version is a
// row of its own (what it sells, the seller's confirmation of their rights, whether the package
// ships the growth surface); an update waits for an admin in `review = 'submitted'` while the
// approved version stays on sale, and on approval its content becomes the listing's.
//   - listings.current_version: the number of the version on sale (the listing row holds its content);
//   - listings.assets_prefix: where that version's pictures and preview live (null: the listing's own prefix);
//   - purchases.listing_version: the version a buyer paid for (they may download it and every later one);
//   - listing_packages: one package per listing version (the package-revision machinery is kept);
//   - purchases.update_seen_version: the newest version whose notice the owner has seen.
// Listings made before versions have no version row: version 1 is the listing row itself, and
// its rights were not confirmed (rights_confirmed_at null).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('listing_versions', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('listing_id').notNullable().references('listings.id').onDelete('CASCADE');
    table.integer('number').notNullable();
    // 'listing': version 1, reviewed with the listing itself; an update is 'submitted', then 'approved' or 'rejected'.
    table.text('review').notNullable();
    table.text('rejection_reason');
    table.uuid('groom_id').notNullable();
    table.uuid('groom_version_id').notNullable();
    table.text('groom_name').notNullable();
    table.integer('version_number');
    table.text('version_name');
    table.jsonb('spec').notNullable();
    table.text('surface_key').notNullable();
    table.text('surface_file_name').notNullable();
    table.text('description').notNullable();
    table.specificType('formats', 'text[]').notNullable();
    table.text('notes').notNullable().defaultTo('');
    table.boolean('ships_surface').notNullable().defaultTo(false);
    // The seller's confirmation that they own or may publish the work and the surface it shows.
    table.uuid('rights_confirmed_by').references('users.id').onDelete('RESTRICT');
    table.timestamp('rights_confirmed_at', { useTz: true });
    table.text('rights_wording_version');
    table.text('assets_status').notNullable().defaultTo('pending');
    table.text('assets_error');
    table.integer('guide_count');
    table.jsonb('pictures').notNullable().defaultTo('[]');
    table.text('package_key');
    table.text('package_file_name');
    table.bigInteger('package_byte_size');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('submitted_at', { useTz: true });
    table.timestamp('decided_at', { useTz: true });
    table.index(['review', 'submitted_at']);
  });
  await knex.raw(`
    ALTER TABLE listing_versions
      ADD CONSTRAINT listing_versions_review CHECK (review IN ('listing', 'submitted', 'approved', 'rejected')),
      ADD CONSTRAINT listing_versions_assets_status CHECK (assets_status IN ('pending', 'ready', 'failed')),
      ADD CONSTRAINT listing_versions_some_formats CHECK (cardinality(formats) > 0),
      ADD CONSTRAINT listing_versions_rights_whole CHECK ((rights_confirmed_at IS NULL) = (rights_confirmed_by IS NULL) AND (rights_confirmed_at IS NULL) = (rights_wording_version IS NULL)),
      ADD CONSTRAINT listing_versions_rejection_has_reason CHECK (review <> 'rejected' OR rejection_reason IS NOT NULL)`);
  // A number is taken by one version that counts; a rejected update leaves its number to the next try.
  await knex.raw(`CREATE UNIQUE INDEX listing_versions_number ON listing_versions (listing_id, number) WHERE review <> 'rejected'`);
  // At most one update waits for the admins per listing.
  await knex.raw(`CREATE UNIQUE INDEX listing_versions_one_waiting ON listing_versions (listing_id) WHERE review = 'submitted'`);

  await knex.raw(`
    ALTER TABLE listings
      ADD COLUMN current_version integer NOT NULL DEFAULT 1,
      ADD COLUMN ships_surface boolean NOT NULL DEFAULT false,
      ADD COLUMN assets_prefix text`);
  await knex.raw(`
    ALTER TABLE purchases
      ADD COLUMN listing_version integer NOT NULL DEFAULT 1,
      ADD COLUMN update_seen_version integer`);
  await knex.raw(`UPDATE purchases SET update_seen_version = listing_version`);
  await knex.raw(`
    ALTER TABLE listing_packages
      ADD COLUMN listing_version integer NOT NULL DEFAULT 1,
      DROP CONSTRAINT listing_packages_pkey,
      ADD PRIMARY KEY (listing_id, listing_version)`);
}

export async function down(knex: Knex) {
  await knex.raw(`DELETE FROM listing_packages WHERE listing_version <> 1`);
  await knex.raw(`ALTER TABLE listing_packages DROP CONSTRAINT listing_packages_pkey, DROP COLUMN listing_version, ADD PRIMARY KEY (listing_id)`);
  await knex.raw(`ALTER TABLE purchases DROP COLUMN listing_version, DROP COLUMN update_seen_version`);
  await knex.raw(`ALTER TABLE listings DROP COLUMN current_version, DROP COLUMN ships_surface, DROP COLUMN assets_prefix`);
  await knex.schema.dropTableIfExists('listing_versions');
}
