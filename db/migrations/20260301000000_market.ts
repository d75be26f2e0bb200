// The market: licences, listings (each freezes one groom version), purchases recorded once from
// the payment provider's signed events, downloads, packages, reviews, sellers' payment accounts,
// payouts. Money is integer cents with its currency beside it.
//
// Listings do not reference the studio's tables with foreign keys: a listing keeps its own copy
// of what it sells (the resolved spec and the growth surface file), so it outlives edits and
// deletion of the groom it came from.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('licences', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.text('slug').notNullable().unique();
    table.text('title').notNullable();
    table.text('summary').notNullable();
    table.text('body').notNullable();
    table.integer('position').notNullable().defaultTo(0);
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('listings', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('seller_id').notNullable().references('users.id').onDelete('RESTRICT');
    // Where it came from (the studio's ids, kept for the seller's reference; no foreign key).
    table.uuid('groom_id').notNullable();
    table.uuid('groom_version_id').notNullable();
    table.text('groom_name').notNullable();
    table.integer('version_number');
    table.text('version_name');
    // The frozen version: the resolved spec and the surface file copied into storage.
    table.jsonb('spec').notNullable();
    table.text('surface_key').notNullable();
    table.text('surface_file_name').notNullable();
    table.text('title').notNullable();
    table.text('description').notNullable();
    table.text('animal').notNullable();
    table.text('coat_length').notNullable();
    table.text('style').notNullable();
    table.text('body_region').notNullable();
    table.integer('price_cents').notNullable();
    table.text('currency').notNullable();
    table.uuid('licence_id').notNullable().references('licences.id');
    table.specificType('formats', 'text[]').notNullable();
    table.text('state').notNullable().defaultTo('draft');
    table.text('rejection_reason');
    // Pictures, guide count and package are made from the frozen version by a background job.
    table.text('assets_status').notNullable().defaultTo('pending');
    table.text('assets_error');
    table.integer('guide_count');
    table.jsonb('pictures').notNullable().defaultTo('[]');
    // Kept up to date in the transactions that change them, for sorting without joins.
    table.integer('sales_count').notNullable().defaultTo(0);
    table.integer('rating_count').notNullable().defaultTo(0);
    table.decimal('rating_average', 3, 2);
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('submitted_at', { useTz: true });
    table.timestamp('decided_at', { useTz: true });
    table.timestamp('published_at', { useTz: true });
    table.timestamp('unlisted_at', { useTz: true });
    table.index(['seller_id', 'created_at']);
    table.index(['state', 'submitted_at']);
  });
  await knex.raw(`
    ALTER TABLE listings
      ADD CONSTRAINT listings_known_state CHECK (state IN ('draft', 'submitted', 'published', 'rejected', 'unlisted')),
      ADD CONSTRAINT listings_known_assets_status CHECK (assets_status IN ('pending', 'ready', 'failed')),
      ADD CONSTRAINT listings_price_range CHECK (price_cents BETWEEN 100 AND 10000000),
      ADD CONSTRAINT listings_currency CHECK (currency IN ('eur', 'usd', 'gbp')),
      ADD CONSTRAINT listings_some_formats CHECK (cardinality(formats) > 0),
      ADD CONSTRAINT listings_rejection_has_reason CHECK (state <> 'rejected' OR rejection_reason IS NOT NULL),
      ADD COLUMN search tsvector GENERATED ALWAYS AS (
        setweight(to_tsvector('english', title), 'A') ||
        setweight(to_tsvector('english', animal || ' ' || coat_length || ' ' || style || ' ' || replace(body_region, '-', ' ')), 'B') ||
        setweight(to_tsvector('english', description), 'C')
      ) STORED
  `);
  // Search reads only published listings: partial indexes for the text, the filters and each sort.
  await knex.raw(`CREATE INDEX listings_search ON listings USING GIN (search) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_formats ON listings USING GIN (formats) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_published_newest ON listings (published_at DESC, id DESC) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_published_sales ON listings (sales_count DESC, published_at DESC, id DESC) WHERE state = 'published'`);
  await knex.raw(
    `CREATE INDEX listings_published_rating ON listings (rating_average DESC NULLS LAST, rating_count DESC, id DESC) WHERE state = 'published'`,
  );
  await knex.raw(`CREATE INDEX listings_published_price ON listings (price_cents, id) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_published_tags ON listings (animal, coat_length, style, body_region) WHERE state = 'published'`);
  await knex.raw(`CREATE INDEX listings_published_guides ON listings (guide_count) WHERE state = 'published'`);

  // Checkouts opened for a buyer, so a second click reuses the open one instead of a second payment.
  await knex.schema.createTable('checkout_sessions', (table) => {
    table.text('session_id').primary();
    table.uuid('listing_id').notNullable().references('listings.id').onDelete('CASCADE');
    table.uuid('buyer_id').notNullable().references('users.id').onDelete('CASCADE');
    table.integer('amount_cents').notNullable();
    table.text('currency').notNullable();
    table.text('url').notNullable();
    table.timestamp('expires_at', { useTz: true }).notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['listing_id', 'buyer_id', 'expires_at']);
  });

  await knex.schema.createTable('purchases', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('listing_id').notNullable().references('listings.id').onDelete('RESTRICT');
    table.uuid('buyer_id').notNullable().references('users.id').onDelete('RESTRICT');
    table.uuid('seller_id').notNullable().references('users.id').onDelete('RESTRICT');
    table.text('checkout_session_id').notNullable().unique('purchases_checkout_session_unique');
    table.text('payment_intent_id').unique('purchases_payment_intent_unique');
    table.integer('amount_cents').notNullable();
    table.text('currency').notNullable();
    table.integer('platform_fee_cents').notNullable();
    table.text('status').notNullable().defaultTo('paid');
    table.text('refund_id');
    table.text('refund_reason');
    table.timestamp('refund_requested_at', { useTz: true });
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('refunded_at', { useTz: true });
    table.index(['buyer_id', 'created_at']);
    table.index(['seller_id', 'created_at']);
    table.index(['seller_id', 'refunded_at']);
  });
  await knex.raw(`
    ALTER TABLE purchases
      ADD CONSTRAINT purchases_known_status CHECK (status IN ('paid', 'refunded')),
      ADD CONSTRAINT purchases_amounts CHECK (amount_cents >= 0 AND platform_fee_cents BETWEEN 0 AND amount_cents),
      ADD CONSTRAINT purchases_refunded_at CHECK ((status = 'refunded') = (refunded_at IS NOT NULL))
  `);
  // One paid purchase per buyer and listing; a refunded one does not count.
  await knex.raw(`CREATE UNIQUE INDEX purchases_one_paid_per_buyer ON purchases (listing_id, buyer_id) WHERE status = 'paid'`);

  // Every webhook event handled, so a repeated delivery changes nothing.
  await knex.schema.createTable('payment_events', (table) => {
    table.text('event_id').primary();
    table.text('type').notNullable();
    table.text('object_id');
    table.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('listing_packages', (table) => {
    table.uuid('listing_id').primary().references('listings.id').onDelete('CASCADE');
    table.uuid('groom_version_id').notNullable();
    table.text('object_key').notNullable();
    table.text('file_name').notNullable();
    table.bigInteger('byte_size').notNullable();
    table.timestamp('built_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('downloads', (table) => {
    table.bigIncrements('id');
    table.uuid('purchase_id').notNullable().references('purchases.id').onDelete('CASCADE');
    table.uuid('listing_id').notNullable().references('listings.id').onDelete('CASCADE');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['purchase_id']);
    table.index(['listing_id', 'created_at']);
  });

  await knex.schema.createTable('reviews', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('listing_id').notNullable().references('listings.id').onDelete('CASCADE');
    table.uuid('buyer_id').notNullable().references('users.id').onDelete('CASCADE');
    table.integer('rating').notNullable();
    table.text('body').notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.unique(['listing_id', 'buyer_id']);
    table.index(['listing_id', 'updated_at']);
  });
  await knex.raw(`ALTER TABLE reviews ADD CONSTRAINT reviews_rating_range CHECK (rating BETWEEN 1 AND 5)`);

  // A seller's connected account at the payment provider, made at the first payout.
  await knex.schema.createTable('seller_accounts', (table) => {
    table.uuid('user_id').primary().references('users.id').onDelete('RESTRICT');
    table.text('account_id').notNullable().unique();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('payouts', (table) => {
    table.uuid('id').primary();
    table.uuid('seller_id').notNullable().references('users.id').onDelete('RESTRICT');
    table.integer('amount_cents').notNullable();
    table.text('currency').notNullable();
    table.text('transfer_id').notNullable().unique();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['seller_id', 'created_at']);
  });
  await knex.raw(`ALTER TABLE payouts ADD CONSTRAINT payouts_positive CHECK (amount_cents > 0)`);
}

export async function down(knex: Knex) {
  for (const table of ['payouts', 'seller_accounts', 'reviews', 'downloads', 'listing_packages', 'payment_events', 'purchases', 'checkout_sessions', 'listings', 'licences']) {
    await knex.schema.dropTableIfExists(table);
  }
}
