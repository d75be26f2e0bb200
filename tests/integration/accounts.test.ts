import { randomUUID } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { MAIL_REQUESTS_PER_ADDRESS, MAIL_REQUESTS_PER_CLIENT, MAIL_WINDOW_MINUTES } from '@/lib/accounts/mail-limits';
import { db, closeDb } from '@/lib/platform/db';
import { requestPasswordReset, resetPassword, resendVerification, signUp, verifyEmail } from '@/lib/accounts/users';
import { checkCredentials } from '@/lib/accounts/sign-in';
import { mailTo, onlyMailTo, tokenFromLink, uniqueEmail } from './helpers';

afterAll(closeDb);

const password = 'lay-of-the-coat-7';

async function confirmedAccount(label: string) {
  const email = uniqueEmail(label);
  await signUp({ displayName: 'Juniper Vale', email, password, role: 'groomer' });
  await verifyEmail(tokenFromLink(await onlyMailTo(email), '/verify-email'));
  return email;
}

describe('sign-up and e-mail confirmation', () => {
  it('creates the account with its role and mails a confirmation link that works once', async () => {
    const email = uniqueEmail('signup');
    const result = await signUp({ displayName: 'Juniper Vale', email, password, role: 'buyer' });
    expect(result).toMatchObject({ ok: true, email });

    const user = await db()('users').where({ email }).first();
    expect(user.email_verified_at).toBeNull();
    expect(user.password_hash).not.toContain(password);
    expect(await db()('user_roles').where({ user_id: user.id }).pluck('role')).toEqual(['buyer']);

    const mail = await onlyMailTo(email);
    expect(mail.subject).toBe('Confirm your e-mail address for Whorlwind');
    const token = tokenFromLink(mail, '/verify-email');

    expect(await verifyEmail(token)).toEqual({ ok: true, email });
    expect((await db()('users').where({ email }).first()).email_verified_at).not.toBeNull();
    expect(await verifyEmail(token)).toEqual({ ok: false, problem: 'used-token' });
  });

  it('answers a taken address as a new one, changes nothing, and mails its owner instead', async () => {
    const email = await confirmedAccount('taken');
    const again = await signUp({ displayName: 'Second Try', email: email, password: 'another-password', role: 'buyer' });
    expect(again).toEqual({ ok: true, email });

    const owners = await db()('users').where({ email });
    expect(owners).toHaveLength(1);
    expect(owners[0].display_name).toBe('Juniper Vale');
    expect(await db()('user_roles').where({ user_id: owners[0].id }).pluck('role')).toEqual(['groomer']);
    const [notice] = await mailTo(email);
    expect(notice.subject).toBe('Someone tried to sign up to Whorlwind with your address');
    expect(notice.text).toMatch(/No new account was made/);
    expect(notice.text).not.toMatch(/token=/);
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
  });

  it('sends an unconfirmed address a new confirmation link when someone signs up with it again', async () => {
    const email = uniqueEmail('again');
    await signUp({ displayName: 'First Try', email, password, role: 'groomer' });
    expect(await signUp({ displayName: 'Second Try', email, password: 'another-password', role: 'buyer' })).toEqual({ ok: true, email });
    const [newest] = await mailTo(email);
    expect(await verifyEmail(tokenFromLink(newest, '/verify-email'))).toEqual({ ok: true, email });
    // The account is the first one: the second form changed nothing.
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
  });

  it('refuses a wrong verification token', async () => {
    expect(await verifyEmail('A'.repeat(43))).toEqual({ ok: false, problem: 'invalid-token' });
  });

  it('refuses an expired verification token and can send a new link', async () => {
    const email = uniqueEmail('late');
    await signUp({ displayName: 'Late Opener', email, password, role: 'groomer' });
    const token = tokenFromLink(await onlyMailTo(email), '/verify-email');
    await db()('account_tokens').where({ purpose: 'verify-email' }).whereIn('user_id', db()('users').where({ email }).select('id')).update({
      expires_at: db().raw(`now() - interval '1 minute'`),
    });

    expect(await verifyEmail(token)).toEqual({ ok: false, problem: 'expired-token' });

    await resendVerification(email);
    const [newest] = await mailTo(email);
    expect(await verifyEmail(tokenFromLink(newest, '/verify-email'))).toEqual({ ok: true, email });
  });

  it('sends no new link to confirmed or unknown addresses', async () => {
    const email = await confirmedAccount('confirmed');
    await resendVerification(email);
    expect(await mailTo(email)).toHaveLength(1);

    const nobody = uniqueEmail('nobody');
    await resendVerification(nobody);
    expect(await mailTo(nobody)).toHaveLength(0);
  });
});

describe('password reset', () => {
  it('changes the password through the mailed link, once', async () => {
    const email = await confirmedAccount('reset');
    await requestPasswordReset(email);
    const [resetMail] = await mailTo(email);
    expect(resetMail.subject).toBe('Choose a new Whorlwind password');
    const token = tokenFromLink(resetMail, '/reset-password');

    expect(await resetPassword({ token, password: 'a-brand-new-pass' })).toEqual({ ok: true, email });
    expect((await checkCredentials({ email, password: 'a-brand-new-pass' }, null)).ok).toBe(true);
    expect(await checkCredentials({ email, password }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
    expect(await resetPassword({ token, password: 'yet-another-pass' })).toEqual({ ok: false, problem: 'used-token' });
  });

  it('refuses an expired reset token and keeps the old password', async () => {
    const email = await confirmedAccount('expired');
    await requestPasswordReset(email);
    const token = tokenFromLink((await mailTo(email))[0], '/reset-password');
    await db()('account_tokens').where({ purpose: 'reset-password' }).whereIn('user_id', db()('users').where({ email }).select('id')).update({
      expires_at: db().raw(`now() - interval '1 second'`),
    });

    expect(await resetPassword({ token, password: 'should-not-stick' })).toEqual({ ok: false, problem: 'expired-token' });
    expect((await checkCredentials({ email, password }, null)).ok).toBe(true);
    expect(await checkCredentials({ email, password: 'should-not-stick' }, null)).toEqual({ ok: false, problem: 'invalid-credentials' });
  });

  it('voids older reset links once the password has changed', async () => {
    const email = await confirmedAccount('two-links');
    await requestPasswordReset(email);
    await requestPasswordReset(email);
    const [newer, older] = await mailTo(email);
    expect((await resetPassword({ token: tokenFromLink(newer, '/reset-password'), password: 'chosen-with-newer' })).ok).toBe(true);
    expect(await resetPassword({ token: tokenFromLink(older, '/reset-password'), password: 'chosen-with-older' })).toEqual({
      ok: false,
      problem: 'used-token',
    });
  });

  it('refuses a wrong reset token', async () => {
    expect(await resetPassword({ token: 'B'.repeat(43), password: 'whatever-pass' })).toEqual({ ok: false, problem: 'invalid-token' });
  });

  it('sends nothing for an unknown address', async () => {
    const nobody = uniqueEmail('unknown');
    await requestPasswordReset(nobody);
    expect(await mailTo(nobody)).toHaveLength(0);
  });
});

describe('limits on account mail', () => {
  it(`sends at most ${MAIL_REQUESTS_PER_ADDRESS} account e-mails to one address within ${MAIL_WINDOW_MINUTES} minutes, counted whether or not it has an account`, async () => {
    for (const email of [await confirmedAccount('flooded'), uniqueEmail('flooded-nobody')]) {
      const before = (await db()('account_requests').where({ email })).length;
      for (let request = before; request < MAIL_REQUESTS_PER_ADDRESS; request += 1) {
        expect(await requestPasswordReset(email)).toEqual({ ok: true });
      }
      expect(await requestPasswordReset(email)).toEqual({ ok: false, problem: 'too-many-requests' });
      expect(await resendVerification(email)).toEqual({ ok: false, problem: 'too-many-requests' });
      expect(await signUp({ displayName: 'Flood', email, password, role: 'buyer' })).toEqual({ ok: false, problem: 'too-many-requests' });
    }
  });

  it('lifts the limit when the window has passed', async () => {
    const email = await confirmedAccount('patient');
    for (let request = 1; request < MAIL_REQUESTS_PER_ADDRESS; request += 1) await requestPasswordReset(email);
    expect(await requestPasswordReset(email)).toEqual({ ok: false, problem: 'too-many-requests' });
    // As if the hour had passed (no waiting in tests).
    await db()('account_requests')
      .where({ email })
      .update({ requested_at: db().raw(`requested_at - make_interval(mins => ?)`, [MAIL_WINDOW_MINUTES]) });
    expect(await requestPasswordReset(email)).toEqual({ ok: true });
  });

  it(`sends at most ${MAIL_REQUESTS_PER_CLIENT} account e-mails for one client, whatever the addresses`, async () => {
    const client = `2001:db8::${randomUUID().slice(0, 4)}:${randomUUID().slice(0, 4)}`;
    for (let request = 0; request < MAIL_REQUESTS_PER_CLIENT; request += 1) {
      expect(await resendVerification(uniqueEmail('client-spray'), client)).toEqual({ ok: true });
    }
    expect(await requestPasswordReset(uniqueEmail('client-spray'), client)).toEqual({ ok: false, problem: 'too-many-requests' });
    expect(await requestPasswordReset(uniqueEmail('client-spray'), '192.0.2.200')).toEqual({ ok: true });
  });
});
