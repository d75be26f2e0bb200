// A buyer's request for a refund, with its reason, waiting in the admins' queue until an admin
// refunds the purchase or declines with an answer; and the buyer's agreement, given at checkout
// before paying, that where the law lets a right to cancel a digital purchase end once the download
// starts, it ends then (kept with the open checkout, then with the purchase it becomes).
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('refund_requests', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('purchase_id').notNullable().references('purchases.id').onDelete('CASCADE');
    table.uuid('buyer_id').notNullable().references('users.id').onDelete('CASCADE');
    table.text('reason').notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    /** 'refunded' or 'declined' once an admin answered; null while it waits. */
    table.text('outcome');
    table.text('answer');
    table.uuid('closed_by').references('users.id').onDelete('SET NULL');
    table.timestamp('closed_at', { useTz: true });
    table.index(['purchase_id']);
  });
  await knex.raw("ALTER TABLE refund_requests ADD CONSTRAINT refund_requests_outcome CHECK (outcome IN ('refunded', 'declined'))");
  await knex.raw('ALTER TABLE refund_requests ADD CONSTRAINT refund_requests_closed CHECK ((outcome IS NULL) = (closed_at IS NULL))');
  // One open request per purchase; a declined one may be followed by another.
  await knex.raw('CREATE UNIQUE INDEX refund_requests_one_open ON refund_requests (purchase_id) WHERE closed_at IS NULL');

  for (const name of ['checkout_sessions', 'purchases']) {
    await knex.schema.alterTable(name, (table) => {
      table.timestamp('cancellation_waived_at', { useTz: true });
    });
  }
}

export async function down(knex: Knex) {
  for (const name of ['checkout_sessions', 'purchases']) {
    await knex.schema.alterTable(name, (table) => {
      table.dropColumn('cancellation_waived_at');
    });
  }
  await knex.schema.dropTable('refund_requests');
}
