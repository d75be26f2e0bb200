// When the confirmation e-mail cannot be sent, sign-up must leave nothing behind. The SMTP
// server address is pointed at a port where nothing listens; the modules are imported after
// that (vitest gives each test file its own module instances) and the variable is restored
// afterwards, so other test files keep the working configuration.
import { createServer } from 'node:net';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { jsonRequest, uniqueEmail } from './helpers';

async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as { port: number };
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

let modules: {
  db: typeof import('@/lib/platform/db');
  accounts: typeof import('@/lib/accounts/users');
  mail: typeof import('@/lib/platform/mail');
  signUpRoute: typeof import('@/app/api/account/sign-up/route');
};

beforeAll(async () => {
  vi.stubEnv('SMTP_PORT', String(await closedPort()));
  modules = {
    db: await import('@/lib/platform/db'),
    accounts: await import('@/lib/accounts/users'),
    mail: await import('@/lib/platform/mail'),
    signUpRoute: await import('@/app/api/account/sign-up/route'),
  };
});

afterAll(async () => {
  await modules.db.closeDb();
  vi.unstubAllEnvs();
});

describe('sign-up while mail cannot be sent', () => {
  it('rolls back the account, its role and its token', async () => {
    const email = uniqueEmail('nomail');
    await expect(modules.accounts.signUp({ displayName: 'Unlucky', email, password: 'pass-word-pass', role: 'groomer' })).rejects.toThrow(
      modules.mail.MailNotSent,
    );
    expect(await modules.db.db()('users').where({ email })).toHaveLength(0);
  });

  it('tells the person through the API that no account was created', async () => {
    const email = uniqueEmail('nomail-api');
    const response = await modules.signUpRoute.POST(
      jsonRequest('/api/account/sign-up', { displayName: 'Unlucky', email, password: 'pass-word-pass', role: 'buyer' }),
    );
    expect(response.status).toBe(502);
    expect((await response.json()).error).toMatchObject({ code: 'mail-failed', message: expect.stringMatching(/no account was created/) });
    expect(await modules.db.db()('users').where({ email })).toHaveLength(0);
  });

  it('leaves no usable link behind when a reset or a new confirmation link cannot be sent', async () => {
    const email = uniqueEmail('nomail-reset');
    const [user] = await modules.db.db()('users').insert({ email, display_name: 'Unlucky', password_hash: 'not-a-hash' }).returning('id');
    await expect(modules.accounts.requestPasswordReset(email)).rejects.toThrow(modules.mail.MailNotSent);
    await expect(modules.accounts.resendVerification(email)).rejects.toThrow(modules.mail.MailNotSent);
    expect(await modules.db.db()('account_tokens').where({ user_id: user.id })).toHaveLength(0);
    // The account itself was not made by these requests and stays.
    expect(await modules.db.db()('users').where({ email })).toHaveLength(1);
  });
});
