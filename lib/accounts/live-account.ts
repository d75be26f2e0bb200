// What a session token is worth now, read from the database at every use of the session.
import { db } from '../platform/db';
import { isRole, type Role } from './roles';

export type LiveAccount = { id: string; email: string; name: string; roles: Role[] };

/**
 * The account a token issued under `sessionVersion` still opens: it exists, is not disabled and
 * its session version has not moved on; with its roles as they are now. Null otherwise.
 */
export async function liveAccount(userId: string, sessionVersion: number): Promise<LiveAccount | null> {
  // A token's subject is not necessarily a uuid (anyone holding the secret could mint one); a
  // malformed id is as unknown as a missing one rather than a database error.
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(userId)) return null;
  const rows: { id: string; email: string; display_name: string; role: string | null }[] = await db()('users')
    .leftJoin('user_roles', 'user_roles.user_id', 'users.id')
    .where({ 'users.id': userId, 'users.session_version': sessionVersion })
    .whereNull('users.disabled_at')
    .select('users.id', 'users.email', 'users.display_name', 'user_roles.role')
    .orderBy('user_roles.role');
  if (rows.length === 0) return null;
  const roles = rows.flatMap((row) => (row.role !== null && isRole(row.role) ? [row.role] : []));
  return { id: rows[0].id, email: rows[0].email, name: rows[0].display_name, roles };
}
