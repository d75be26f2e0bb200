// Money that is never lost or doubled, and a listing's files that match what it sells:
//   - a payout is a row first (pending, with a deterministic idempotency key derived from the
//     seller and the purchases it pays), then the provider's transfer, then the row completed;
//     payout_items say which purchases each payout paid (a sale, once) and which refunds of
//     paid-out sales it settled (a clawback, once), so no purchase is paid or taken back twice;
//   - payment_events keep what became of each event (a refused one is kept for the record);
//   - a listing's revision moves on with every edit that changes its package, so the asset job
//     can tell that the listing changed while it was building;
//   - a review is withdrawn (not deleted) from the rating when its purchase is refunded.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.raw(`
    ALTER TABLE payouts
      ADD COLUMN status text NOT NULL DEFAULT 'paid' CHECK (status IN ('pending', 'paid', 'failed')),
      ADD COLUMN idempotency_key text,
      ADD COLUMN failure text,
      ADD COLUMN completed_at timestamptz,
      ALTER COLUMN transfer_id DROP NOT NULL,
      ADD CONSTRAINT payouts_paid_has_transfer CHECK (status <> 'paid' OR transfer_id IS NOT NULL)`);
  await knex.raw(`UPDATE payouts SET completed_at = created_at, idempotency_key = 'payout-' || id WHERE completed_at IS NULL`);
  await knex.raw(`ALTER TABLE payouts ALTER COLUMN idempotency_key SET NOT NULL, ADD CONSTRAINT payouts_idempotency_key_unique UNIQUE (idempotency_key)`);
  // At most one payout in flight per seller and currency: a retry resumes it instead of starting another.
  await knex.raw(`CREATE UNIQUE INDEX payouts_one_pending ON payouts (seller_id, currency) WHERE status = 'pending'`);

  await knex.schema.createTable('payout_items', (table) => {
    table.uuid('payout_id').notNullable().references('payouts.id').onDelete('CASCADE');
    table.uuid('purchase_id').notNullable().references('purchases.id').onDelete('RESTRICT');
    table.text('kind').notNullable();
    // Signed: + the seller's net of a sale paid, − the net of a refunded sale taken back.
    table.integer('amount_cents').notNullable();
    table.primary(['purchase_id', 'kind']);
    table.index(['payout_id']);
  });
  await knex.raw(`ALTER TABLE payout_items ADD CONSTRAINT payout_items_kind CHECK (kind IN ('sale', 'clawback'))`);
  // Payouts made before items existed paid the balance of their day: the sales made before them
  // and not refunded by then. Record those, so they are not paid again.
  for (const payout of await knex('payouts').orderBy('created_at').select('id', 'seller_id', 'currency', 'created_at')) {
    const paid = await knex('purchases')
      .where({ seller_id: payout.seller_id, currency: payout.currency })
      .where('created_at', '<', payout.created_at)
      .where((query) => query.whereNull('refunded_at').orWhere('refunded_at', '>', payout.created_at))
      .whereNotExists(knex('payout_items').whereRaw('payout_items.purchase_id = purchases.id'))
      .select('id', knex.raw('amount_cents - platform_fee_cents AS net'));
    if (paid.length > 0) {
      await knex('payout_items').insert(paid.map((row: { id: string; net: number }) => ({ payout_id: payout.id, purchase_id: row.id, kind: 'sale', amount_cents: row.net })));
    }
  }

  await knex.raw(`ALTER TABLE payment_events ADD COLUMN outcome text`);
  await knex.raw(`ALTER TABLE listings ADD COLUMN revision integer NOT NULL DEFAULT 1`);
  await knex.raw(`ALTER TABLE listing_packages ADD COLUMN listing_revision integer`);
  await knex.raw(`ALTER TABLE reviews ADD COLUMN withdrawn_at timestamptz`);
}

export async function down(knex: Knex) {
  await knex.raw(`ALTER TABLE reviews DROP COLUMN withdrawn_at`);
  await knex.raw(`ALTER TABLE listing_packages DROP COLUMN listing_revision`);
  await knex.raw(`ALTER TABLE listings DROP COLUMN revision`);
  await knex.raw(`ALTER TABLE payment_events DROP COLUMN outcome`);
  await knex.schema.dropTableIfExists('payout_items');
  await knex.raw(`DELETE FROM payouts WHERE status <> 'paid'`);
  await knex.raw(`
    ALTER TABLE payouts
      DROP CONSTRAINT payouts_paid_has_transfer,
      DROP COLUMN status, DROP COLUMN idempotency_key, DROP COLUMN failure, DROP COLUMN completed_at,
      ALTER COLUMN transfer_id SET NOT NULL`);
}
