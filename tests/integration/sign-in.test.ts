import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { requestPasswordReset, resetPassword, signUp, verifyEmail } from '@/lib/accounts/users';
import { checkCredentials, MAX_FAILURES_PER_CLIENT, MAX_FAILURES_PER_EMAIL } from '@/lib/accounts/sign-in';
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
    const before = await db()('sign_in_attempts').count('* as count');
    expect(await checkCredentials({ email: 'not an address', password: '' }, null)).toEqual({ ok: false, problem: 'invalid-input' });
    expect(await db()('sign_in_attempts').count('* as count')).toEqual(before);
  });
});

describe('sign-in attempt limits', () => {
  it(`locks an address after ${MAX_FAILURES_PER_EMAIL} failures, even for the right password`, async () => {
    const email = await account('locked', { confirmed: true });
    for (let attempt = 0; attempt < MAX_FAILURES_PER_EMAIL; attempt += 1) {
      expect(await checkCredentials({ email, password: `guess-number-${attempt}` }, null)).toEqual({
        ok: false,
        problem: 'invalid-credentials',
      });
    }
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'too-many-attempts' });
    expect(await db()('sign_in_attempts').where({ email, succeeded: false }).count('* as count')).toEqual([
      { count: String(MAX_FAILURES_PER_EMAIL) },
    ]);
  });

  it('starts counting again after a successful sign-in', async () => {
    const email = await account('reset-count', { confirmed: true });
    for (let attempt = 0; attempt < MAX_FAILURES_PER_EMAIL - 1; attempt += 1) {
      await checkCredentials({ email, password: `guess-number-${attempt}` }, null);
    }
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
    expect(await checkCredentials({ email, password: 'one-more-guess' }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
  });

  it('lifts the lock when the password is reset', async () => {
    const email = await account('unlock', { confirmed: true });
    for (let attempt = 0; attempt < MAX_FAILURES_PER_EMAIL; attempt += 1) {
      await checkCredentials({ email, password: `guess-number-${attempt}` }, null);
    }
    await requestPasswordReset(email);
    const token = tokenFromLink((await mailTo(email))[0], '/reset-password');
    await resetPassword({ token, password: 'fresh-start-pass' });
    expect((await checkCredentials({ email, password: 'fresh-start-pass' }, null)).ok).toBe(true);
  });

  it(`locks a client address after ${MAX_FAILURES_PER_CLIENT} failures across addresses`, async () => {
    const client = '192.0.2.77';
    const email = await account('sprayed', { confirmed: true });
    for (let attempt = 0; attempt < MAX_FAILURES_PER_CLIENT; attempt += 1) {
      await checkCredentials({ email: uniqueEmail('spray'), password: 'common-password' }, client);
    }
    expect(await checkCredentials({ email, password }, client)).toEqual({ ok: false, problem: 'too-many-attempts' });
    expect((await checkCredentials({ email, password }, '192.0.2.78')).ok).toBe(true);
  });
});
