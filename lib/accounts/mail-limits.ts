// Limits on the requests that send account mail (sign-up, a new confirmation link, a reset link):
// without them anyone could make Whorlwind mail an address over and over, or tie up the mail
// service. Requests are rows in PostgreSQL (account_requests), like sign-in attempts, so the
// limits hold across server processes; the caller takes the address's lock (lockAddress) first.
// The numbers are common practice, with no source: enough for a person who mistyped or waited
// for a slow mail, far too few to be of use for flooding.
import type { Knex } from 'knex';
import { countWithinMinutes, lockUntilCommit } from '../platform/db';

export type MailAction = 'sign-up' | 'verify-email' | 'reset-password';

/** Account mail requests for one address, all three kinds together, within the window. */
export const MAIL_REQUESTS_PER_ADDRESS = 5;
/** Account mail requests from one (known) client address within the window, whatever the address. */
export const MAIL_REQUESTS_PER_CLIENT = 30;
export const MAIL_WINDOW_MINUTES = 60;

export const TOO_MANY_MAIL_REQUESTS = `Too many e-mails were asked for this address, or from your network, in the last ${MAIL_WINDOW_MINUTES} minutes. Try again later.`;

/** Serialises the account-mail requests of one address (sign-up, links) until the transaction ends. */
export async function lockAddress(trx: Knex.Transaction, email: string): Promise<void> {
  await lockUntilCommit(trx, `account-mail:${email}`);
}

/**
 * Records the request when it is within the limits and answers true; answers false and records
 * nothing when it is not (so waiting always lifts the limit). Run under lockAddress.
 */
export async function admitMailRequest(trx: Knex.Transaction, action: MailAction, email: string, clientAddress: string | null): Promise<boolean> {
  if ((await countWithinMinutes(trx, 'account_requests', { email }, 'requested_at', MAIL_WINDOW_MINUTES)) >= MAIL_REQUESTS_PER_ADDRESS) return false;
  if (clientAddress !== null && (await countWithinMinutes(trx, 'account_requests', { client_address: clientAddress }, 'requested_at', MAIL_WINDOW_MINUTES)) >= MAIL_REQUESTS_PER_CLIENT) return false;
  await trx('account_requests').insert({ action, email, client_address: clientAddress });
  return true;
}
