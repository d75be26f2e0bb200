// Sessions that end, and limits on the account mail.
// - users.session_version: a session token carries the version it was issued under; a password
//   reset or disabling the account bumps it, so every older token stops working at its next use.
// - users.disabled_at: an admin switched the account off; it cannot sign in and has no session.
// - account_requests: one row per request that sends account mail (sign-up, a new confirmation
//   link, a reset link), so the limits per address and per client hold across server processes.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('users', (table) => {
    table.integer('session_version').notNullable().defaultTo(1);
    table.timestamp('disabled_at', { useTz: true });
  });
  await knex.schema.createTable('account_requests', (table) => {
    table.bigIncrements('id');
    table.text('action').notNullable();
    table.text('email').notNullable();
    table.text('client_address');
    table.timestamp('requested_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['email', 'requested_at']);
    table.index(['client_address', 'requested_at']);
  });
  await knex.raw(
    `ALTER TABLE account_requests ADD CONSTRAINT account_requests_known_action CHECK (action IN ('sign-up', 'verify-email', 'reset-password'))`,
  );
  // The sign-in lock is per address and client now: its failures are read by that pair.
  await knex.schema.alterTable('sign_in_attempts', (table) => {
    table.index(['client_address', 'attempted_at']);
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('sign_in_attempts', (table) => {
    table.dropIndex(['client_address', 'attempted_at']);
  });
  await knex.schema.dropTable('account_requests');
  await knex.schema.alterTable('users', (table) => {
    table.dropColumn('disabled_at');
    table.dropColumn('session_version');
  });
}
