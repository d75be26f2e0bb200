// Checking a sign-in, with the attempt limits. Attempts are rows in PostgreSQL, so the limits
// hold across all server processes; an advisory lock per e-mail address keeps two concurrent
// attempts from both slipping under the limit.
import type { Knex } from 'knex';
import { db } from '../platform/db';
import { passwordMatches, spendComparisonTime } from './passwords';
import { rolesOf } from './users';
import type { Role } from './roles';
import { signInSchema } from './schemas';
import { SIGN_IN_WINDOW_MINUTES, type SignInProblem } from './sign-in-problems';

/** Failed attempts for one e-mail address within the window before it is locked. */
export const MAX_FAILURES_PER_EMAIL = 5;
/** Failed attempts from one client address within the window, whatever the e-mail. */
export const MAX_FAILURES_PER_CLIENT = 50;

export type SignedInUser = { id: string; email: string; name: string; roles: Role[] };

export type SignInResult = { ok: true; user: SignedInUser } | { ok: false; problem: SignInProblem };

export async function checkCredentials(credentials: unknown, clientAddress: string | null): Promise<SignInResult> {
  const parsed = signInSchema.safeParse(credentials);
  if (!parsed.success) return { ok: false, problem: 'invalid-input' };
  const { email, password } = parsed.data;

  return db().transaction(async (trx) => {
    await trx.raw(`SELECT pg_advisory_xact_lock(hashtext('sign-in:' || ?))`, [email]);

    // Failures count from the start of the window or the last successful sign-in, whichever is later.
    const emailFailures = await countFailures(
      trx,
      `email = ? AND attempted_at > coalesce(
         (SELECT max(attempted_at) FROM sign_in_attempts WHERE email = ? AND succeeded), '-infinity')`,
      [email, email],
    );
    const clientFailures = clientAddress ? await countFailures(trx, 'client_address = ?', [clientAddress]) : 0;
    // Refused attempts are not recorded, so waiting out the window always lifts the lock.
    if (emailFailures >= MAX_FAILURES_PER_EMAIL || clientFailures >= MAX_FAILURES_PER_CLIENT) {
      return { ok: false, problem: 'too-many-attempts' } as const;
    }

    const user: { id: string; email: string; display_name: string; password_hash: string; email_verified_at: Date | null } | undefined =
      await trx('users').where({ email }).select('id', 'email', 'display_name', 'password_hash', 'email_verified_at').first();
    const matches = user ? await passwordMatches(password, user.password_hash) : await spendComparisonTime(password);

    await trx('sign_in_attempts').insert({ email, client_address: clientAddress, succeeded: Boolean(user && matches) });
    if (!user || !matches) return { ok: false, problem: 'invalid-credentials' } as const;
    if (!user.email_verified_at) return { ok: false, problem: 'email-not-verified' } as const;
    return {
      ok: true,
      user: { id: user.id, email: user.email, name: user.display_name, roles: await rolesOf(user.id, trx) },
    } as const;
  });
}

async function countFailures(trx: Knex.Transaction, condition: string, bindings: string[]): Promise<number> {
  const result = await trx.raw(
    `SELECT count(*)::int AS failures FROM sign_in_attempts
      WHERE NOT succeeded AND attempted_at > now() - make_interval(mins => ?) AND ${condition}`,
    [SIGN_IN_WINDOW_MINUTES, ...bindings],
  );
  return result.rows[0].failures as number;
}
