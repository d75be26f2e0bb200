// The route handlers: validation, status codes and the JSON envelope, called as Next calls them.
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { POST as signUpPost } from '@/app/api/account/sign-up/route';
import { POST as resendPost } from '@/app/api/account/verification/route';
import { POST as resetRequestPost } from '@/app/api/account/password-reset/route';
import { POST as resetConfirmPost } from '@/app/api/account/password-reset/confirm/route';
import { GET as healthGet } from '@/app/api/health/route';
import { MAIL_REQUESTS_PER_ADDRESS, TOO_MANY_MAIL_REQUESTS } from '@/lib/accounts/mail-limits';
import { jsonRequest, mailTo, uniqueEmail } from './helpers';

afterAll(closeDb);

const form = (email: string) => ({ displayName: 'Bramble Oakes', email, password: 'sleek-otter-coat', role: 'groomer' });

describe('POST /api/account/sign-up', () => {
  it('creates the account and answers 201', async () => {
    const email = uniqueEmail('route');
    const response = await signUpPost(jsonRequest('/api/account/sign-up', form(email)));
    expect(response.status).toBe(201);
    expect(await response.json()).toEqual({ data: { email } });
  });

  it('answers a taken address exactly as a new one, so the form does not tell who has an account', async () => {
    const taken = uniqueEmail('route-taken');
    await signUpPost(jsonRequest('/api/account/sign-up', form(taken)));
    const again = await signUpPost(jsonRequest('/api/account/sign-up', form(taken.toUpperCase())));
    const fresh = await signUpPost(jsonRequest('/api/account/sign-up', form(uniqueEmail('route-fresh'))));
    expect(again.status).toBe(fresh.status);
    expect(Object.keys((await again.json()).data)).toEqual(Object.keys((await fresh.json()).data));
    expect(await db()('users').where({ email: taken })).toHaveLength(1);
  });

  it('answers 429 once an address has asked for too many e-mails', async () => {
    const email = uniqueEmail('route-flood');
    let response = await signUpPost(jsonRequest('/api/account/sign-up', form(email)));
    for (let request = 1; request <= MAIL_REQUESTS_PER_ADDRESS && response.ok; request += 1) {
      response = await resetRequestPost(jsonRequest('/api/account/password-reset', { email }));
    }
    expect(response.status).toBe(429);
    expect((await response.json()).error).toEqual({ code: 'too-many-requests', message: TOO_MANY_MAIL_REQUESTS });
    expect(await mailTo(email)).toHaveLength(MAIL_REQUESTS_PER_ADDRESS);
  });

  it('answers 400 with a message per field and creates nothing', async () => {
    const email = uniqueEmail('route-short');
    const response = await signUpPost(jsonRequest('/api/account/sign-up', { ...form(email), password: 'short', role: 'overlord' }));
    expect(response.status).toBe(400);
    expect((await response.json()).error).toEqual({
      code: 'invalid-input',
      message: 'Some fields need another look.',
      fields: { password: 'Use at least 10 characters.', role: 'Choose whether you groom or only buy.' },
    });
    expect(await db()('users').where({ email })).toHaveLength(0);
    expect(await mailTo(email)).toHaveLength(0);
  });

  it('answers 400 to a body that is not JSON', async () => {
    const response = await signUpPost(jsonRequest('/api/account/sign-up', '{"displayName": '));
    expect(response.status).toBe(400);
    expect((await response.json()).error.message).toBe('The request body must be JSON.');
  });
});

describe('e-mail links through the API', () => {
  it('answers the same for known and unknown addresses', async () => {
    const email = uniqueEmail('route-resend');
    await signUpPost(jsonRequest('/api/account/sign-up', form(email)));
    for (const address of [email, uniqueEmail('route-stranger')]) {
      const resend = await resendPost(jsonRequest('/api/account/verification', { email: address }));
      expect(await resend.json()).toEqual({ data: { email: address } });
      const reset = await resetRequestPost(jsonRequest('/api/account/password-reset', { email: address }));
      expect(await reset.json()).toEqual({ data: { email: address } });
    }
    expect(await mailTo(email)).toHaveLength(3);
  });

  it('names the problem with a reset token', async () => {
    const response = await resetConfirmPost(
      jsonRequest('/api/account/password-reset/confirm', { token: 'C'.repeat(43), password: 'long-enough-pass' }),
    );
    expect(response.status).toBe(400);
    expect((await response.json()).error).toMatchObject({ code: 'invalid-token', message: expect.stringMatching(/reset link is not valid/) });
  });

  it('checks the new password before the token', async () => {
    const response = await resetConfirmPost(jsonRequest('/api/account/password-reset/confirm', { token: 'C'.repeat(43), password: 'tiny' }));
    expect(response.status).toBe(400);
    expect((await response.json()).error.fields).toEqual({ password: 'Use at least 10 characters.' });
  });
});

describe('GET /api/health', () => {
  it('reports the database reachable', async () => {
    const response = await healthGet();
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ data: { database: 'reachable' } });
  });
});
