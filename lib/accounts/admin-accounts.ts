// What an admin may change about an account: its roles and whether it is switched off. Sessions
// read both from the database at every use (session.ts), so a change applies at the next request:
// a removed role is refused (403) at once, and a disabled account's sessions end (its session
// version is bumped too, so re-enabling it does not bring the old sessions back).
import { HttpError } from '../http/errors';
import { db } from '../platform/db';
import type { Actor } from './actor';
import { z } from 'zod';
import { isRole, ROLES } from './roles';
import type { AdminAccount } from './types';

export const accountChangeSchema = z
  .object({
    roles: z.array(z.enum(ROLES, { error: `A role is one of ${ROLES.join(', ')}.` })).optional(),
    disabled: z.boolean({ error: 'Say true or false.' }).optional(),
  })
  .refine((change) => change.roles !== undefined || change.disabled !== undefined, { message: 'Give roles, disabled, or both.' });
export type AccountChange = z.infer<typeof accountChangeSchema>;


type AccountRow = { id: string; email: string; display_name: string; disabled_at: Date | null; roles: string[] | null };

function toAdminAccount(row: AccountRow): AdminAccount {
  return {
    id: row.id,
    email: row.email,
    displayName: row.display_name,
    roles: (row.roles ?? []).filter(isRole).sort(),
    disabled: row.disabled_at !== null,
  };
}

function accountsQuery() {
  return db()('users')
    .leftJoin('user_roles', 'user_roles.user_id', 'users.id')
    .groupBy('users.id')
    .select('users.id', 'users.email', 'users.display_name', 'users.disabled_at', db().raw(`array_remove(array_agg(user_roles.role), NULL) AS roles`));
}

/** Accounts whose address contains `search` (all when empty), by address, at most 50. */
export async function findAccounts(search: string): Promise<AdminAccount[]> {
  const query = accountsQuery().orderBy('users.email').limit(50);
  if (search !== '') query.where('users.email', 'like', `%${search.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
  return (await query).map(toAdminAccount);
}

export async function changeAccount(actor: Actor, userId: string, change: AccountChange): Promise<AdminAccount> {
  // An admin cannot lock themselves out: someone else has to take their admin role or switch them off.
  if (userId === actor.userId && (change.disabled === true || (change.roles && !change.roles.includes('admin')))) {
    throw new HttpError(409, 'wrong-state', 'You cannot switch off your own account or take away your own admin role; ask another admin.');
  }
  await db().transaction(async (trx) => {
    const user = await trx('users').where({ id: userId }).forUpdate().first('id', 'disabled_at');
    if (!user) throw new HttpError(404, 'not-found', 'There is no such account.');
    if (change.roles) {
      await trx('user_roles').where({ user_id: userId }).whereNotIn('role', change.roles).delete();
      if (change.roles.length > 0) {
        await trx('user_roles')
          .insert(change.roles.map((role) => ({ user_id: userId, role })))
          .onConflict(['user_id', 'role'])
          .ignore();
      }
    }
    if (change.disabled === true && user.disabled_at === null) {
      await trx('users').where({ id: userId }).update({ disabled_at: trx.fn.now(), session_version: trx.raw('session_version + 1') });
    } else if (change.disabled === false) {
      await trx('users').where({ id: userId }).update({ disabled_at: null });
    }
  });
  const [row] = await accountsQuery().where('users.id', userId);
  return toAdminAccount(row);
}
