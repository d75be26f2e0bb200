// Checking a sign-in, with the attempt limits. Attempts are rows in PostgreSQL, so the limits
// hold across all server processes; an advisory lock per e-mail address keeps two concurrent
// attempts from both slipping under the limit.
//
// The lock is on the pair (address, client): failures from one client do not lock the owner out
// from another, and each failure past the free ones doubles the wait (an exponential back-off, as
// NIST SP 800-63B §5.2.2 suggests for throttling guesses without a permanent lock-out). A client
// whose address is unknown (no trusted proxy, see client-address.ts) counts as one client, so
// there the pair is the address alone.
import type { Knex } from 'knex';
import { db, lockUntilCommit } from '../platform/db';
import { passwordMatches, spendComparisonTime } from './passwords';
import { rolesOf } from './users';
import type { Role } from './roles';
import { signInSchema } from './schemas';
import { SIGN_IN_WINDOW_MINUTES, type SignInProblem } from './sign-in-problems';

/** Failures of one address from one client (since that pair's last success) before the back-off starts. */
export const FREE_FAILURES_PER_PAIR = 5;
/** The first wait after the free failures; each further failure doubles it, up to the cap. */
export const FIRST_WAIT_MINUTES = 1;
export const LONGEST_WAIT_MINUTES = 60;
/** Failures older than this are forgotten by the back-off. Common practice, no source: a day. */
const PAIR_MEMORY_HOURS = 24;
/** Failed attempts from one (known) client address within the window, whatever the e-mail. */
export const MAX_FAILURES_PER_CLIENT = 50;

export type SignedInUser = { id: string; email: string; name: string; roles: Role[]; sessionVersion: number };

export type SignInResult = { ok: true; user: SignedInUser } | { ok: false; problem: SignInProblem };

/** How long the pair must wait after its latest failure, given its failures in a row. */
export function backOffMinutes(failures: number): number {
  if (failures < FREE_FAILURES_PER_PAIR) return 0;
  return Math.min(FIRST_WAIT_MINUTES * 2 ** (failures - FREE_FAILURES_PER_PAIR), LONGEST_WAIT_MINUTES);
}

type UserRow = {
  id: string;
  email: string;
  display_name: string;
  password_hash: string;
  email_verified_at: Date | null;
  disabled_at: Date | null;
  session_version: number;
};

export async function checkCredentials(credentials: unknown, clientAddress: string | null): Promise<SignInResult> {
  const parsed = signInSchema.safeParse(credentials);
  if (!parsed.success) return { ok: false, problem: 'invalid-input' };
  const { email, password } = parsed.data;

  return db().transaction(async (trx) => {
    await lockUntilCommit(trx, `sign-in:${email}`);

    // Refused attempts are not recorded, so waiting out the back-off always lifts the lock.
    if ((await pairLocked(trx, email, clientAddress)) || (clientAddress !== null && (await clientFailures(trx, clientAddress)) >= MAX_FAILURES_PER_CLIENT)) {
      return { ok: false, problem: 'too-many-attempts' } as const;
    }

    const user: UserRow | undefined = await trx('users')
      .where({ email })
      .select('id', 'email', 'display_name', 'password_hash', 'email_verified_at', 'disabled_at', 'session_version')
      .first();
    const matches = user ? await passwordMatches(password, user.password_hash) : await spendComparisonTime(password);

    await trx('sign_in_attempts').insert({ email, client_address: clientAddress, succeeded: Boolean(user && matches) });
    if (!user || !matches) return { ok: false, problem: 'invalid-credentials' } as const;
    if (user.disabled_at) return { ok: false, problem: 'account-disabled' } as const;
    if (!user.email_verified_at) return { ok: false, problem: 'email-not-verified' } as const;
    return {
      ok: true,
      user: { id: user.id, email: user.email, name: user.display_name, roles: await rolesOf(user.id, trx), sessionVersion: user.session_version },
    } as const;
  });
}

/** Whether the pair is still waiting out its back-off. */
async function pairLocked(trx: Knex.Transaction, email: string, clientAddress: string | null): Promise<boolean> {
  const result = await trx.raw(
    `SELECT count(*)::int AS failures, extract(epoch FROM now() - max(attempted_at)) / 60 AS minutes_since_last
       FROM sign_in_attempts
      WHERE email = ? AND client_address IS NOT DISTINCT FROM ? AND NOT succeeded
        AND attempted_at > now() - make_interval(hours => ?)
        AND attempted_at > coalesce((SELECT max(attempted_at) FROM sign_in_attempts
                                      WHERE email = ? AND client_address IS NOT DISTINCT FROM ? AND succeeded), '-infinity')`,
    [email, clientAddress, PAIR_MEMORY_HOURS, email, clientAddress],
  );
  const { failures, minutes_since_last: minutesSinceLast } = result.rows[0] as { failures: number; minutes_since_last: string | null };
  const wait = backOffMinutes(failures);
  return wait > 0 && minutesSinceLast !== null && Number(minutesSinceLast) < wait;
}

async function clientFailures(trx: Knex.Transaction, clientAddress: string): Promise<number> {
  const result = await trx.raw(
    `SELECT count(*)::int AS failures FROM sign_in_attempts
      WHERE NOT succeeded AND client_address = ? AND attempted_at > now() - make_interval(mins => ?)`,
    [clientAddress, SIGN_IN_WINDOW_MINUTES],
  );
  return result.rows[0].failures as number;
}
