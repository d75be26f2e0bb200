import { randomUUID } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { requestPasswordReset, resetPassword, signUp, verifyEmail } from '@/lib/accounts/users';
import { backOffMinutes, checkCredentials, FREE_FAILURES_PER_PAIR, MAX_FAILURES_PER_CLIENT } from '@/lib/accounts/sign-in';
import { DEMO_ACCOUNTS } from '@/db/demo-scenario';
import { mailTo, onlyMailTo, tokenFromLink, uniqueEmail } from './helpers';

afterAll(closeDb);

const password = 'follow-the-flow-3';

async function account(label: string, { confirmed }: { confirmed: boolean }) {
  const email = uniqueEmail(label);
  await signUp({ displayName: 'Rook Hazeldine', email, password, role: 'groomer' });
  if (confirmed) await verifyEmail(tokenFromLink(await onlyMailTo(email), '/verify-email'));
  return email;
}

describe('checking a sign-in', () => {
  it('signs in a confirmed account and hands over its roles', async () => {
    const email = await account('ok', { confirmed: true });
    const result = await checkCredentials({ email: email.toUpperCase(), password }, '10.0.0.1');
    expect(result).toMatchObject({ ok: true, user: { email, name: 'Rook Hazeldine', roles: ['groomer'] } });
  });

  it('signs in every demo account with the password the README gives', async () => {
    for (const demo of DEMO_ACCOUNTS) {
      const result = await checkCredentials({ email: demo.email, password: demo.password }, null);
      expect(result).toMatchObject({ ok: true, user: { roles: demo.roles } });
    }
  });

  it('gives the same answer for a wrong password and an unknown address', async () => {
    const email = await account('wrong', { confirmed: true });
    expect(await checkCredentials({ email, password: 'not-the-password' }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
    expect(await checkCredentials({ email: uniqueEmail('ghost'), password }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
  });

  it('asks for confirmation before an unconfirmed account signs in', async () => {
    const email = await account('unconfirmed', { confirmed: false });
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'email-not-verified' });
  });

  it('refuses malformed input without touching the attempt log', async () => {
    // Counted for this test's own client address only: other test files write attempts at the same time.
    const client = `2001:db8::${randomUUID().slice(0, 4)}:${randomUUID().slice(0, 4)}`;
    expect(await checkCredentials({ email: 'not an address', password: '' }, client)).toEqual({ ok: false, problem: 'invalid-input' });
    expect(await db()('sign_in_attempts').where({ client_address: client })).toHaveLength(0);
  });

  it('refuses a disabled account even with the right password, without saying so to others', async () => {
    const email = await account('disabled', { confirmed: true });
    await db()('users').where({ email }).update({ disabled_at: db().fn.now() });
    expect(await checkCredentials({ email, password: 'a-wrong-guess' }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'account-disabled' });
  });
});

/** Moves the pair's attempts back in time, as if the minutes had passed (no waiting in tests). */
async function minutesPass(email: string, minutes: number) {
  await db()('sign_in_attempts').where({ email }).update({ attempted_at: db().raw(`attempted_at - ? * interval '1 minute'`, [minutes]) });
}

async function fail(email: string, client: string | null, times: number) {
  for (let attempt = 0; attempt < times; attempt += 1) {
    expect(await checkCredentials({ email, password: `guess-number-${attempt}` }, client)).toEqual({ ok: false, problem: 'invalid-credentials' });
  }
}

describe('sign-in attempt limits', () => {
  it(`locks the address and client pair after ${FREE_FAILURES_PER_PAIR} failures, even for the right password`, async () => {
    const email = await account('locked', { confirmed: true });
    await fail(email, '203.0.113.9', FREE_FAILURES_PER_PAIR);
    expect(await checkCredentials({ email, password }, '203.0.113.9')).toEqual({ ok: false, problem: 'too-many-attempts' });
    // The refused try is not recorded: only the failures count.
    expect(await db()('sign_in_attempts').where({ email, succeeded: false })).toHaveLength(FREE_FAILURES_PER_PAIR);
  });

  it('does not lock the owner out from another client', async () => {
    const email = await account('not-locked-elsewhere', { confirmed: true });
    await fail(email, '203.0.113.10', FREE_FAILURES_PER_PAIR);
    expect(await checkCredentials({ email, password }, '203.0.113.10')).toEqual({ ok: false, problem: 'too-many-attempts' });
    expect((await checkCredentials({ email, password }, '198.51.100.20')).ok).toBe(true);
  });

  it('backs off exponentially: each failure past the free ones doubles the wait', async () => {
    expect([4, 5, 6, 7, 8, 20].map(backOffMinutes)).toEqual([0, 1, 2, 4, 8, 60]);
    const email = await account('back-off', { confirmed: true });
    await fail(email, null, FREE_FAILURES_PER_PAIR);
    await minutesPass(email, 1.1);
    // The one-minute wait is over: one more try is allowed, and its failure makes the wait two minutes.
    await fail(email, null, 1);
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'too-many-attempts' });
    await minutesPass(email, 1.1);
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'too-many-attempts' });
    await minutesPass(email, 1);
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
  });

  it('starts counting again after a successful sign-in', async () => {
    const email = await account('reset-count', { confirmed: true });
    await fail(email, null, FREE_FAILURES_PER_PAIR - 1);
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
    expect(await checkCredentials({ email, password: 'one-more-guess' }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
  });

  it('lifts the lock when the password is reset', async () => {
    const email = await account('unlock', { confirmed: true });
    await fail(email, null, FREE_FAILURES_PER_PAIR);
    await requestPasswordReset(email);
    const token = tokenFromLink((await mailTo(email))[0], '/reset-password');
    await resetPassword({ token, password: 'fresh-start-pass' });
    expect((await checkCredentials({ email, password: 'fresh-start-pass' }, null)).ok).toBe(true);
  });

  it(`locks a client address after ${MAX_FAILURES_PER_CLIENT} failures across addresses`, async () => {
    // An address of its own (from 2001:db8::/32, for documentation, RFC 3849), so no other test adds to its count.
    const client = `2001:db8::${randomUUID().slice(0, 4)}:${randomUUID().slice(0, 4)}`;
    const email = await account('sprayed', { confirmed: true });
    for (let attempt = 0; attempt < MAX_FAILURES_PER_CLIENT; attempt += 1) {
      await checkCredentials({ email: uniqueEmail('spray'), password: 'common-password' }, client);
    }
    expect(await checkCredentials({ email, password }, client)).toEqual({ ok: false, problem: 'too-many-attempts' });
    expect((await checkCredentials({ email, password }, '192.0.2.78')).ok).toBe(true);
  });
});
