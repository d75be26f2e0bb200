// Accounts: sign-up, e-mail verification and password reset. Each operation runs in one
// transaction; the e-mail is sent before the transaction commits, so a message that cannot
// be sent leaves no account or token behind.
import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { db, isUniqueViolation } from '../platform/db';
import { sendMail } from '../platform/mail';
import { passwordResetMail, verificationMail } from './mail-texts';
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

export type SignUpResult = { ok: true; userId: string; email: string } | { ok: false; problem: 'email-taken' };

export async function signUp(input: SignUpInput): Promise<SignUpResult> {
  const passwordHash = await hashPassword(input.password);
  try {
    return await db().transaction(async (trx) => {
      const [user] = await trx('users')
        .insert({ email: input.email, display_name: input.displayName, password_hash: passwordHash })
        .returning(['id', 'email']);
      await trx('user_roles').insert({ user_id: user.id, role: input.role });
      const token = await issueToken(trx, user.id, 'verify-email');
      await sendMail(verificationMail(user.email, input.displayName, token));
      return { ok: true as const, userId: user.id as string, email: user.email as string };
    });
  } catch (error) {
    if (isUniqueViolation(error, 'users_email_unique')) return { ok: false, problem: 'email-taken' };
    throw error;
  }
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
export async function resendVerification(email: string): Promise<void> {
  await db().transaction(async (trx) => {
    const user = await findUserByEmail(trx, email);
    if (!user || user.email_verified_at) return;
    const token = await issueToken(trx, user.id, 'verify-email');
    await sendMail(verificationMail(user.email, user.display_name, token));
  });
}

/** Sends a reset link when an account has this address; silent otherwise, like above. */
export async function requestPasswordReset(email: string): Promise<void> {
  await db().transaction(async (trx) => {
    const user = await findUserByEmail(trx, email);
    if (!user) return;
    const token = await issueToken(trx, user.id, 'reset-password');
    await sendMail(passwordResetMail(user.email, user.display_name, token));
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
      .update({ password_hash: passwordHash, email_verified_at: trx.raw('coalesce(email_verified_at, now())') })
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
