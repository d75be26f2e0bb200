// Accounts: studios, users with roles, one-time e-mail tokens, and sign-in attempts.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.createTable('studios', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.text('name').notNullable();
    table.text('slug').notNullable().unique();
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable('users', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    // Stored lower-cased by the application; the unique constraint guards against races.
    table.text('email').notNullable().unique('users_email_unique');
    table.text('display_name').notNullable();
    table.text('password_hash').notNullable();
    table.timestamp('email_verified_at', { useTz: true });
    table.uuid('studio_id').references('studios.id').onDelete('SET NULL');
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE users ADD CONSTRAINT users_email_lower_case CHECK (email = lower(email))`);

  await knex.schema.createTable('user_roles', (table) => {
    table.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    table.text('role').notNullable();
    table.timestamp('granted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.primary(['user_id', 'role']);
  });
  await knex.raw(`ALTER TABLE user_roles ADD CONSTRAINT user_roles_known_role CHECK (role IN ('groomer', 'buyer', 'admin'))`);

  // Links sent by e-mail. Only a SHA-256 of the token is kept, so a leaked table opens nothing.
  await knex.schema.createTable('account_tokens', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
    table.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
    table.text('purpose').notNullable();
    table.text('token_hash').notNullable().unique();
    table.timestamp('expires_at', { useTz: true }).notNullable();
    table.timestamp('used_at', { useTz: true });
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['user_id', 'purpose']);
  });
  await knex.raw(
    `ALTER TABLE account_tokens ADD CONSTRAINT account_tokens_known_purpose CHECK (purpose IN ('verify-email', 'reset-password'))`,
  );

  // Every sign-in attempt, so the limit holds across server processes.
  await knex.schema.createTable('sign_in_attempts', (table) => {
    table.bigIncrements('id');
    table.text('email').notNullable();
    table.text('client_address');
    table.boolean('succeeded').notNullable();
    table.timestamp('attempted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    table.index(['email', 'attempted_at']);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable('sign_in_attempts');
  await knex.schema.dropTable('account_tokens');
  await knex.schema.dropTable('user_roles');
  await knex.schema.dropTable('users');
  await knex.schema.dropTable('studios');
}
