// The demo scenario: two invented studios and one confirmed account for each role.
// Idempotent: running it again restores the demo accounts (and their passwords) and leaves
// everything else in the database alone.
import type { Knex } from 'knex';
import { DEMO_ACCOUNTS, DEMO_STUDIOS } from '../demo-scenario';
import { hashPassword } from '../../lib/accounts/passwords';

export async function seed(knex: Knex) {
  await knex.transaction(async (trx) => {
    const studioIds = new Map<string, string>();
    for (const studio of DEMO_STUDIOS) {
      const [row] = await trx('studios').insert(studio).onConflict('slug').merge(['name']).returning(['id', 'slug']);
      studioIds.set(row.slug, row.id);
    }
    for (const account of DEMO_ACCOUNTS) {
      const [user] = await trx('users')
        .insert({
          email: account.email,
          display_name: account.displayName,
          password_hash: await hashPassword(account.password),
          email_verified_at: trx.fn.now(),
          studio_id: studioIds.get(account.studio),
        })
        .onConflict('email')
        .merge(['display_name', 'password_hash', 'email_verified_at', 'studio_id'])
        .returning(['id']);
      await trx('user_roles').where({ user_id: user.id }).whereNotIn('role', account.roles).delete();
      await trx('user_roles')
        .insert(account.roles.map((role) => ({ user_id: user.id, role })))
        .onConflict(['user_id', 'role'])
        .ignore();
      await trx('sign_in_attempts').where({ email: account.email }).delete();
    }
  });
}
