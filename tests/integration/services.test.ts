// The server-side clients against the local stand-ins, through the real SDKs and protocols.
import { afterAll, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { randomUUID } from 'node:crypto';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { sendMail } from '@/lib/platform/mail';
import { getObjectBytes, presignDownload, presignUpload, putObject, storageReachable } from '@/lib/platform/storage';
import { payments } from '@/lib/platform/payments';
import { mailTo, uniqueEmail } from './helpers';

afterAll(closeDb);

describe('database', () => {
  it('is migrated', async () => {
    const tables = await db()('information_schema.tables').where({ table_schema: 'public' }).pluck('table_name');
    expect(tables).toEqual(expect.arrayContaining(['users', 'user_roles', 'account_tokens', 'sign_in_attempts', 'studios']));
  });
});

describe('file storage', () => {
  it('reaches the bucket', async () => {
    expect(await storageReachable()).toBe(true);
  });

  it('stores and returns bytes through the SDK', async () => {
    const key = `tests/${randomUUID()}.bin`;
    const bytes = new Uint8Array([0, 1, 2, 250, 251, 252]);
    await putObject(key, bytes, 'application/octet-stream');
    expect(await getObjectBytes(key)).toEqual(bytes);
  });

  it('takes an upload and serves a download through presigned URLs', async () => {
    const key = `tests/${randomUUID()}.obj`;
    const body = 'v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n';
    const upload = await fetch(await presignUpload(key, 'text/plain'), { method: 'PUT', headers: { 'content-type': 'text/plain' }, body });
    expect(upload.status).toBe(200);
    const download = await fetch(await presignDownload(key));
    expect(await download.text()).toBe(body);
  });
});

describe('mail', () => {
  it('goes over SMTP to the sink, which shows it', async () => {
    const to = uniqueEmail('mail');
    await sendMail({ to, subject: 'A parting on the left', text: 'Flow away on both sides.', html: '<p>Flow away on both sides.</p>' });
    const [caught] = await mailTo(to);
    expect(caught).toMatchObject({ to: [to], subject: 'A parting on the left', text: 'Flow away on both sides.' });
    expect(caught.from).toBe('no-reply@whorlwind.example');
  });
});

describe('payments', () => {
  it('answers the stripe SDK from the fake', async () => {
    const balance = await payments().balance.retrieve();
    expect(balance.object).toBe('balance');
    expect(balance.livemode).toBe(false);
  });

  it('refuses a wrong key the way the SDK understands', async () => {
    const endpoint = new URL(env().STRIPE_API_URL);
    const wrongKey = new Stripe('sk_test_not_ours', {
      host: endpoint.hostname,
      port: Number(endpoint.port),
      protocol: 'http',
      maxNetworkRetries: 0,
      telemetry: false,
    });
    await expect(wrongKey.balance.retrieve()).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
  });
});
