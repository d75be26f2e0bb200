// Accounts: sign-up, e-mail verification and password reset. The database work of each runs in
// one short transaction; the e-mail is sent after it commits, so no pool connection waits on the
// mail service (up to its 10 s timeout). A message that cannot be sent is undone instead: the
// token it carried is deleted, and an account made by the same sign-up with it, so nothing is
// left that the person cannot redo by asking again. (No outbox with retries: a link's token is
// stored only as its SHA-256, so only the request that made it can mail it.)
import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from '../platform/db';
import { sendMail, type OutgoingMail } from '../platform/mail';
import { admitMailRequest, lockAddress, type MailAction } from './mail-limits';
import { passwordResetMail, signUpAttemptMail, verificationMail } from './mail-texts';
import { hashPassword } from './passwords';
import { isRole, type Role } from './roles';
import type { ResetPasswordInput, SignUpInput } from './schemas';

export type TokenPurpose = 'verify-email' | 'reset-password';

const TOKEN_LIFETIME_MINUTES: Record<TokenPurpose, number> = {
  'verify-email': 24 * 60,
  'reset-password': 60,
};

export type TokenProblem = 'invalid-token' | 'expired-token' | 'used-token';

export const TOKEN_PROBLEM_MESSAGES: Record<TokenPurpose, Record<TokenProblem, string>> = {
  'verify-email': {
    'invalid-token': 'This confirmation link is not valid. Check that the whole link was opened, or ask for a new one.',
    'expired-token': 'This confirmation link has expired. Ask for a new one below.',
    'used-token': 'This confirmation link was already used. Your address is confirmed: you can sign in.',
  },
  'reset-password': {
    'invalid-token': 'This reset link is not valid. Check that the whole link was opened, or ask for a new one.',
    'expired-token': 'This reset link has expired. Ask for a new one.',
    'used-token': 'This reset link can no longer be used: it was used already, or the password has changed since. Ask for a new one if you need it.',
  },
};

function hashToken(token: string) {
  return createHash('sha256').update(token).digest('hex');
}

/** Creates a one-time token and returns it; only its hash is stored. */
async function issueToken(trx: Knex.Transaction, userId: string, purpose: TokenPurpose): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  await trx('account_tokens').insert({
    user_id: userId,
    purpose,
    token_hash: hashToken(token),
    expires_at: trx.raw(`now() + make_interval(mins => ?)`, [TOKEN_LIFETIME_MINUTES[purpose]]),
  });
  return token;
}

type TokenRow = { id: string; user_id: string; expires_at: Date; used_at: Date | null };

/** Finds and locks the token row, or says what is wrong with the token. */
async function claimToken(trx: Knex.Transaction, token: string, purpose: TokenPurpose): Promise<TokenRow | TokenProblem> {
  const row: (TokenRow & { expired: boolean }) | undefined = await trx('account_tokens')
    .where({ token_hash: hashToken(token), purpose })
    .select('id', 'user_id', 'expires_at', 'used_at', trx.raw('expires_at <= now() AS expired'))
    .forUpdate()
    .first();
  if (!row) return 'invalid-token';
  if (row.used_at) return 'used-token';
  if (row.expired) return 'expired-token';
  await trx('account_tokens').where({ id: row.id }).update({ used_at: trx.fn.now() });
  return row;
}

/** Refused by the limits of mail-limits.ts: nothing was recorded or sent. */
export type MailLimited = { ok: false; problem: 'too-many-requests' };

/** What a transaction decided to mail, and how to undo its rows when the mail cannot be sent. */
type PlannedMail = { mail: OutgoingMail; undo: (trx: Knex.Transaction) => Promise<unknown> } | null;

/** Sends the planned mail after the commit; when it cannot go, undoes its rows and rethrows. */
async function sendOrUndo(planned: PlannedMail): Promise<void> {
  if (!planned) return;
  try {
    await sendMail(planned.mail);
  } catch (error) {
    await db().transaction((trx) => planned.undo(trx));
    throw error;
  }
}

/** Runs `plan` for a request within the limits (under the address's lock), then mails. */
async function limitedMailRequest(
  action: MailAction,
  email: string,
  clientAddress: string | null,
  plan: (trx: Knex.Transaction) => Promise<PlannedMail>,
): Promise<{ ok: true } | MailLimited> {
  const planned = await db().transaction(async (trx) => {
    await lockAddress(trx, email);
    if (!(await admitMailRequest(trx, action, email, clientAddress))) return 'limited' as const;
    return plan(trx);
  });
  if (planned === 'limited') return { ok: false, problem: 'too-many-requests' };
  await sendOrUndo(planned);
  return { ok: true };
}

function deleteToken(token: string) {
  return (trx: Knex.Transaction) => trx('account_tokens').where({ token_hash: hashToken(token) }).delete();
}

export type SignUpResult = { ok: true; email: string } | MailLimited;

/**
 * Signs up, answering the same whether or not the address has an account, so the form cannot be
 * used to find out who has one: a new address gets an unconfirmed account and its confirmation
 * link; an unconfirmed account gets a new link (its first mail may have been lost); a confirmed
 * one gets a note that someone tried to sign up with it. Only the new account takes the form's
 * name, password and role. The password is hashed in every case, so the time does not tell either.
 */
export async function signUp(input: SignUpInput, clientAddress: string | null = null): Promise<SignUpResult> {
  const passwordHash = await hashPassword(input.password);
  const result = await limitedMailRequest('sign-up', input.email, clientAddress, async (trx) => {
    const existing = await findUserByEmail(trx, input.email);
    if (existing?.email_verified_at) return { mail: signUpAttemptMail(existing.email, existing.display_name), undo: async () => {} };
    if (existing) {
      const token = await issueToken(trx, existing.id, 'verify-email');
      return { mail: verificationMail(existing.email, existing.display_name, token), undo: deleteToken(token) };
    }
    const [user] = await trx('users')
      .insert({ email: input.email, display_name: input.displayName, password_hash: passwordHash })
      .returning(['id', 'email']);
    await trx('user_roles').insert({ user_id: user.id, role: input.role });
    const token = await issueToken(trx, user.id, 'verify-email');
    return {
      mail: verificationMail(user.email, input.displayName, token),
      // The account goes with its link, unless a sign-up since (after this commit) sent another link for it.
      undo: async (undoTrx: Knex.Transaction) => {
        await deleteToken(token)(undoTrx);
        await undoTrx('users')
          .where({ id: user.id })
          .whereNull('email_verified_at')
          .whereNotExists(undoTrx('account_tokens').whereRaw('account_tokens.user_id = users.id'))
          .delete();
      },
    };
  });
  return result.ok ? { ok: true, email: input.email } : result;
}

export type VerifyEmailResult = { ok: true; email: string } | { ok: false; problem: TokenProblem };

export async function verifyEmail(token: string): Promise<VerifyEmailResult> {
  return db().transaction(async (trx) => {
    const claimed = await claimToken(trx, token, 'verify-email');
    if (typeof claimed === 'string') return { ok: false, problem: claimed };
    const [user] = await trx('users')
      .where({ id: claimed.user_id })
      .update({ email_verified_at: trx.raw('coalesce(email_verified_at, now())') })
      .returning(['email']);
    return { ok: true, email: user.email as string };
  });
}

type UserForMail = { id: string; email: string; display_name: string; email_verified_at: Date | null };

async function findUserByEmail(trx: Knex.Transaction, email: string): Promise<UserForMail | undefined> {
  return trx('users').where({ email }).select('id', 'email', 'display_name', 'email_verified_at').forUpdate().first();
}

/**
 * Sends a new confirmation link when an unconfirmed account has this address. Says nothing
 * about whether one does, so the form cannot be used to find out who has an account.
 */
export async function resendVerification(email: string, clientAddress: string | null = null): Promise<{ ok: true } | MailLimited> {
  return limitedMailRequest('verify-email', email, clientAddress, async (trx) => {
    const user = await findUserByEmail(trx, email);
    if (!user || user.email_verified_at) return null;
    const token = await issueToken(trx, user.id, 'verify-email');
    return { mail: verificationMail(user.email, user.display_name, token), undo: deleteToken(token) };
  });
}

/** Sends a reset link when an account has this address; silent otherwise, like above. */
export async function requestPasswordReset(email: string, clientAddress: string | null = null): Promise<{ ok: true } | MailLimited> {
  return limitedMailRequest('reset-password', email, clientAddress, async (trx) => {
    const user = await findUserByEmail(trx, email);
    if (!user) return null;
    const token = await issueToken(trx, user.id, 'reset-password');
    return { mail: passwordResetMail(user.email, user.display_name, token), undo: deleteToken(token) };
  });
}

export type ResetPasswordResult = { ok: true; email: string } | { ok: false; problem: TokenProblem };

export async function resetPassword(input: ResetPasswordInput): Promise<ResetPasswordResult> {
  const passwordHash = await hashPassword(input.password);
  return db().transaction(async (trx) => {
    const claimed = await claimToken(trx, input.token, 'reset-password');
    if (typeof claimed === 'string') return { ok: false, problem: claimed };
    // Opening the link proved the address is theirs, so it counts as confirmed too.
    const [user] = await trx('users')
      .where({ id: claimed.user_id })
      // A new session version ends every session signed in before (session.ts): whoever knew the old
      // password is signed out everywhere.
      .update({
        password_hash: passwordHash,
        email_verified_at: trx.raw('coalesce(email_verified_at, now())'),
        session_version: trx.raw('session_version + 1'),
      })
      .returning(['email']);
    // Other reset links sent earlier stop working once the password has changed.
    await trx('account_tokens')
      .where({ user_id: claimed.user_id, purpose: 'reset-password' })
      .whereNull('used_at')
      .update({ used_at: trx.fn.now() });
    // A new password lifts a sign-in lock caused by failures with the old one.
    await trx('sign_in_attempts').where({ email: user.email, succeeded: false }).delete();
    return { ok: true, email: user.email as string };
  });
}

export type AccountSummary = { id: string; email: string; displayName: string; roles: Role[]; studioName: string | null };

export async function accountSummary(userId: string): Promise<AccountSummary | null> {
  const user = await db()('users')
    .leftJoin('studios', 'studios.id', 'users.studio_id')
    .where('users.id', userId)
    .select('users.id', 'users.email', 'users.display_name', 'studios.name as studio_name')
    .first();
  if (!user) return null;
  return {
    id: user.id,
    email: user.email,
    displayName: user.display_name,
    roles: await rolesOf(userId),
    studioName: user.studio_name ?? null,
  };
}

export async function rolesOf(userId: string, connection: Knex | Knex.Transaction = db()): Promise<Role[]> {
  const rows: { role: string }[] = await connection('user_roles').where({ user_id: userId }).select('role').orderBy('role');
  return rows.map((row) => row.role).filter(isRole);
}
