import { expect, test } from '@playwright/test';
import { closeDb, db } from '../../lib/platform/db';
import { randomUUID } from 'node:crypto';
import { encode } from 'next-auth/jwt';
import { FREE_FAILURES_PER_PAIR } from '../../lib/accounts/sign-in';
import { env } from '../../lib/platform/env';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { confirmedAccount, expectSignedInAs, linkFromNewestMail, newestMailTo, pageAlert, pageStatus, signInThroughForm, uniqueEmail } from './helpers';

test.afterAll(closeDb);

test('sign up, confirm through the mailed link, sign in and sign out', async ({ page }) => {
  const email = uniqueEmail('journey');
  await page.goto('/signup');
  await page.getByLabel('Your name').fill('Fennel Ashdown');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill('a-proper-coat-42');
  await page.getByText('I groom').click();
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.getByText('we sent an e-mail to')).toContainText(email);

  // Not confirmed yet: signing in is refused with a way to get a new link.
  await signInThroughForm(page, email, 'a-proper-coat-42');
  await expect(pageAlert(page)).toHaveText(/Confirm your e-mail address first/);
  await expect(page.getByRole('button', { name: 'Send a new confirmation link' })).toBeVisible();

  await page.goto(await linkFromNewestMail(email, '/verify-email'));
  await expect(page.getByRole('heading', { name: 'Your address is confirmed' })).toBeVisible();
  await page.getByRole('link', { name: 'Sign in' }).last().click();

  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill('a-proper-coat-42');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expectSignedInAs(page, 'Fennel Ashdown');
  await expect(page.getByTestId('signed-in-as')).toContainText('Groomer');
  await expect(page.getByRole('navigation', { name: 'Areas' }).getByRole('link', { name: 'Studio' })).toBeVisible();

  await page.getByRole('navigation', { name: 'Areas' }).getByRole('link', { name: 'Studio' }).click();
  await expect(page.getByRole('heading', { name: 'Studio', level: 1 })).toBeVisible();

  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page.getByRole('link', { name: 'Create an account' }).first()).toBeVisible();
  await expect(page.getByTestId('signed-in-as')).toHaveCount(0);
  const response = await page.goto('/studio');
  expect(new URL(page.url()).pathname).toBe('/signin');
  expect(response?.status()).toBe(200);
});

test('sign-up names a short password, and answers a taken address as any other (mailing its owner instead)', async ({ page }) => {
  const owner = await confirmedAccount('owner', 'groomer', 'the-owners-password');
  await page.goto('/signup');
  await page.getByLabel('Your name').fill('Second Comer');
  await page.getByLabel('E-mail address').fill(owner.email);
  await page.getByLabel('Password').fill('short');
  await page.getByText('I buy').click();
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.locator('[data-field-error="password"]')).toHaveText('Use at least 10 characters.');

  await page.getByLabel('Password').fill('long-enough-now');
  await expect(page.locator('[data-field-error="password"]')).toHaveCount(0);
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.getByText('we sent an e-mail to')).toContainText(owner.email);
  await expect(page.locator('[data-field-error="email"]')).toHaveCount(0);
  expect((await newestMailTo(owner.email)).subject).toBe('Someone tried to sign up to Whorlwind with your address');
  expect(await db()('users').where({ display_name: 'Second Comer' })).toHaveLength(0);
});

test('signing in never leaves the site, whatever the callback link says', async ({ page, baseURL }) => {
  const account = await confirmedAccount('redirect', 'buyer', 'stay-on-this-site');
  await page.goto('/signin?callbackUrl=/%09/evil.example/');
  await page.getByLabel('E-mail address').fill(account.email);
  await page.getByLabel('Password').fill(account.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expectSignedInAs(page, account.displayName);
  expect(new URL(page.url()).origin).toBe(new URL(baseURL!).origin);
});

test('a session cookie for an account that does not exist opens nothing', async ({ page, baseURL }) => {
  const forged = await encode({
    secret: env().NEXTAUTH_SECRET,
    token: { sub: randomUUID(), name: 'Nobody', email: 'nobody@browser.example', roles: ['admin'], sessionVersion: 1 },
  });
  await page.context().addCookies([{ name: 'next-auth.session-token', value: forged, url: baseURL! }]);
  await page.goto('/admin');
  expect(new URL(page.url()).pathname).toBe('/signin');
  await expect(page.getByTestId('signed-in-as')).toHaveCount(0);
});

test('a wrong confirmation link says so and offers a new one', async ({ page }) => {
  await page.goto(`/verify-email?token=${'Q'.repeat(43)}`);
  await expect(pageAlert(page)).toHaveText(/confirmation link is not valid/);
  await expect(page.getByRole('button', { name: 'Send a new confirmation link' })).toBeVisible();
});

test('a wrong password is refused, and too many lock the address', async ({ page }) => {
  const account = await confirmedAccount('locked', 'buyer', 'the-right-password');
  for (let attempt = 1; attempt <= FREE_FAILURES_PER_PAIR; attempt += 1) {
    await signInThroughForm(page, account.email, `wrong-password-${attempt}`);
    await expect(pageAlert(page)).toHaveText('The e-mail address or the password is wrong.');
  }
  await signInThroughForm(page, account.email, account.password);
  await expect(pageAlert(page)).toHaveText(/Too many failed sign-ins/);
  await expect(page.getByTestId('signed-in-as')).toHaveCount(0);
});

test('password reset: an expired link is refused, a fresh one works', async ({ page }) => {
  const account = await confirmedAccount('reset', 'groomer', 'forgotten-password');
  const requestLink = async () => {
    await page.goto('/signin');
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await expect(page.getByRole('heading', { name: 'Forgot your password?' })).toBeVisible();
    await page.getByLabel('E-mail address').fill(account.email);
    await page.getByRole('button', { name: 'Send me a reset link' }).click();
    await expect(pageStatus(page)).toContainText('a link to choose a new password is on its way');
    return linkFromNewestMail(account.email, '/reset-password');
  };

  const expiredLink = await requestLink();
  await db()('account_tokens')
    .where({ purpose: 'reset-password' })
    .whereIn('user_id', db()('users').where({ email: account.email }).select('id'))
    .update({ expires_at: db().raw(`now() - interval '1 minute'`) });
  await page.goto(expiredLink);
  await page.getByLabel('New password').fill('never-gets-saved');
  await page.getByRole('button', { name: 'Save the new password' }).click();
  await expect(pageAlert(page)).toContainText('This reset link has expired.');

  await page.goto(await requestLink());
  await page.getByLabel('New password').fill('remembered-this-time');
  await page.getByRole('button', { name: 'Save the new password' }).click();
  await expect(pageStatus(page)).toContainText('is changed');

  await signInThroughForm(page, account.email, 'remembered-this-time');
  await expectSignedInAs(page, account.displayName);
});

test('an admin takes a role away and switches an account off: it applies at the next request', async ({ page, browser, baseURL }) => {
  const groomer = await confirmedAccount('demoted', 'groomer', 'soon-a-buyer-only');
  await signInThroughForm(page, groomer.email, groomer.password);
  await expectSignedInAs(page, groomer.displayName);
  expect((await page.goto('/studio'))?.status()).toBe(200);

  const adminContext = await browser.newContext({ baseURL });
  const adminPage = await adminContext.newPage();
  const admin = DEMO_ACCOUNTS.find((account) => account.roles.includes('admin'))!;
  await signInThroughForm(adminPage, admin.email, admin.password);
  await expectSignedInAs(adminPage, admin.displayName);
  await adminPage.goto('/admin');
  await adminPage.getByRole('link', { name: /Accounts/ }).click();
  await adminPage.getByLabel('E-mail contains').fill(groomer.email);
  await adminPage.getByRole('button', { name: 'Find' }).click();
  const row = adminPage.getByTestId('admin-account').filter({ hasText: groomer.email });
  await expect(row).toHaveCount(1);
  await row.getByLabel('Groomer').uncheck();
  await row.getByLabel('Buyer').check();
  const saved = adminPage.waitForResponse((response) => response.url().includes('/api/admin/accounts/') && response.request().method() === 'PATCH');
  await row.getByRole('button', { name: 'Save roles' }).click();
  expect((await saved).status()).toBe(200);

  // The same session, without signing in again: selling is closed to it now (the studio stays open to buyers).
  expect((await page.goto('/sales'))?.status()).toBe(403);
  expect((await page.goto('/library'))?.status()).toBe(200);

  adminPage.once('dialog', (dialog) => dialog.accept());
  await row.getByRole('button', { name: 'Switch off' }).click();
  await expect(row).toContainText('switched off');
  await page.goto('/library');
  expect(new URL(page.url()).pathname).toBe('/signin');
  await signInThroughForm(page, groomer.email, groomer.password);
  await expect(pageAlert(page)).toHaveText(/switched off by an administrator/);
  await adminContext.close();
});
