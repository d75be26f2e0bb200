// Sessions that end: every use of a session cookie is checked against the database (the account
// exists, is not disabled, its session version is the token's), and the roles are read there too.
// Route handlers are called as Next.js calls them, with the session cookie next-auth set at sign-in.
import { randomUUID } from 'node:crypto';
import { callRoute, expectJson, signedInAccount, signedInAdmin, signIn } from './studio-helpers';
import { afterAll, describe, expect, it } from 'vitest';
import { encode } from 'next-auth/jwt';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { requestPasswordReset, resetPassword } from '@/lib/accounts/users';
import * as adminMailRoute from '@/app/api/admin/mail/route';
import * as adminAccountsRoute from '@/app/api/admin/accounts/route';
import * as adminAccountRoute from '@/app/api/admin/accounts/[id]/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import * as payoutsRoute from '@/app/api/sales/payouts/route';
import { mailTo, tokenFromLink } from './helpers';

afterAll(closeDb);

const listSurfaces = (cookie: string) => callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie });
// Selling is the groomer's alone (buyers enter the studio too, to fit what they bought).
const listPayouts = (cookie: string) => callRoute(payoutsRoute, 'GET', '/api/sales/payouts', { cookie });

function changeAccount(adminCookie: string, id: string, body: unknown) {
  return callRoute(adminAccountRoute, 'PATCH', `/api/admin/accounts/${id}`, { cookie: adminCookie, body, params: { id } });
}

describe('a session cookie is only as good as the account behind it', () => {
  it('refuses a token signed with the secret for a user that does not exist, even with the admin role in it', async () => {
    const forged = await encode({
      secret: env().NEXTAUTH_SECRET,
      token: { sub: randomUUID(), name: 'Nobody', email: 'nobody@tests.example', roles: ['admin'], sessionVersion: 1 },
    });
    const response = await callRoute(adminMailRoute, 'GET', '/api/admin/mail', { cookie: `next-auth.session-token=${forged}` });
    expect((await expectJson(response, 401)).error.code).toBe('not-signed-in');
  });

  it('refuses a token of a real user that claims a role the user does not have', async () => {
    const groomer = await signedInAccount('groomer', 'claims-admin');
    const forged = await encode({
      secret: env().NEXTAUTH_SECRET,
      token: { sub: groomer.userId, name: 'x', email: groomer.email, roles: ['admin'], sessionVersion: 1 },
    });
    const response = await callRoute(adminMailRoute, 'GET', '/api/admin/mail', { cookie: `next-auth.session-token=${forged}` });
    expect((await expectJson(response, 403)).error.code).toBe('forbidden');
  });

  it('ends every older session when the password is reset', async () => {
    const groomer = await signedInAccount('groomer', 'reset-ends');
    await expectJson(await listSurfaces(groomer.cookie), 200);
    await requestPasswordReset(groomer.email);
    const token = tokenFromLink((await mailTo(groomer.email))[0], '/reset-password');
    expect((await resetPassword({ token, password: 'after-the-reset-1' })).ok).toBe(true);

    expect((await expectJson(await listSurfaces(groomer.cookie), 401)).error.code).toBe('not-signed-in');
    // Signing in again with the new password gives a session that works.
    await expectJson(await listSurfaces(await signIn(groomer.email, 'after-the-reset-1')), 200);
  });
});

describe('the admin changes roles and switches accounts off', () => {
  it('a removed role is refused at the next request (403), the other roles keep working', async () => {
    const [admin, groomer] = await Promise.all([signedInAdmin(), signedInAccount('groomer', 'demoted')]);
    await expectJson(await listPayouts(groomer.cookie), 200);
    const changed = await expectJson(await changeAccount(admin.cookie, groomer.userId, { roles: ['buyer'] }), 200);
    expect(changed.data).toMatchObject({ id: groomer.userId, roles: ['buyer'], disabled: false });

    expect((await expectJson(await listPayouts(groomer.cookie), 403)).error.code).toBe('forbidden');
    // The buyer's role keeps the studio open.
    await expectJson(await listSurfaces(groomer.cookie), 200);
    // Given back, it works again in the same session.
    await expectJson(await changeAccount(admin.cookie, groomer.userId, { roles: ['buyer', 'groomer'] }), 200);
    await expectJson(await listPayouts(groomer.cookie), 200);
  });

  it('a disabled account loses its sessions and cannot sign in; enabling it needs a new sign-in', async () => {
    const [admin, groomer] = await Promise.all([signedInAdmin(), signedInAccount('groomer', 'switched-off')]);
    await expectJson(await changeAccount(admin.cookie, groomer.userId, { disabled: true }), 200);
    expect((await expectJson(await listSurfaces(groomer.cookie), 401)).error.code).toBe('not-signed-in');
    await expect(signIn(groomer.email, 'long-winter-coat')).rejects.toThrow(/gave no session/);

    await expectJson(await changeAccount(admin.cookie, groomer.userId, { disabled: false }), 200);
    expect((await expectJson(await listSurfaces(groomer.cookie), 401)).error.code).toBe('not-signed-in');
    await expectJson(await listSurfaces(await signIn(groomer.email, 'long-winter-coat')), 200);
  });

  it('finds accounts by address, refuses non-admins, and does not let an admin lock themselves out', async () => {
    const [admin, groomer] = await Promise.all([signedInAdmin(), signedInAccount('groomer', 'findable')]);
    const found = await expectJson(await callRoute(adminAccountsRoute, 'GET', `/api/admin/accounts?search=${groomer.email}`, { cookie: admin.cookie }), 200);
    expect(found.data.accounts).toEqual([{ id: groomer.userId, email: groomer.email, displayName: 'Studio findable', roles: ['groomer'], disabled: false }]);
    await expectJson(await callRoute(adminAccountsRoute, 'GET', '/api/admin/accounts', { cookie: groomer.cookie }), 403);
    await expectJson(await changeAccount(groomer.cookie, groomer.userId, { roles: ['admin'] }), 403);

    const self = await expectJson(await changeAccount(admin.cookie, admin.userId, { disabled: true }), 409);
    expect(self.error.message).toMatch(/cannot switch off your own account/);
    await expectJson(await changeAccount(admin.cookie, randomUUID(), { disabled: true }), 404);
    expect((await db()('users').where({ id: admin.userId }).first()).disabled_at).toBeNull();
  });
});
