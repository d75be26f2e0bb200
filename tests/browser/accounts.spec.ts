import { expect, test } from '@playwright/test';
import { closeDb, db } from '../../lib/platform/db';
import { MAX_FAILURES_PER_EMAIL } from '../../lib/accounts/sign-in';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { confirmedAccount, expectSignedInAs, linkFromNewestMail, pageAlert, pageStatus, signInThroughForm, uniqueEmail } from './helpers';

test.afterAll(closeDb);

test('sign up, confirm through the mailed link, sign in and sign out', async ({ page }) => {
  const email = uniqueEmail('journey');
  await page.goto('/signup');
  await page.getByLabel('Your name').fill('Fennel Ashdown');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill('a-proper-coat-42');
  await page.getByText('I groom').click();
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.getByText('we sent a confirmation link to')).toContainText(email);

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

test('sign-up names what is wrong: a short password, a taken address', async ({ page }) => {
  await page.goto('/signup');
  await page.getByLabel('Your name').fill('Second Comer');
  await page.getByLabel('E-mail address').fill(DEMO_ACCOUNTS[0].email);
  await page.getByLabel('Password').fill('short');
  await page.getByText('I buy').click();
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.locator('[data-field-error="password"]')).toHaveText('Use at least 10 characters.');

  await page.getByLabel('Password').fill('long-enough-now');
  await expect(page.locator('[data-field-error="password"]')).toHaveCount(0);
  await page.getByRole('button', { name: 'Create my account' }).click();
  await expect(page.locator('[data-field-error="email"]')).toHaveText(/already uses this e-mail address/);
  expect(await db()('users').where({ display_name: 'Second Comer' })).toHaveLength(0);
});

test('a wrong confirmation link says so and offers a new one', async ({ page }) => {
  await page.goto(`/verify-email?token=${'Q'.repeat(43)}`);
  await expect(pageAlert(page)).toHaveText(/confirmation link is not valid/);
  await expect(page.getByRole('button', { name: 'Send a new confirmation link' })).toBeVisible();
});

test('a wrong password is refused, and too many lock the address', async ({ page }) => {
  const account = await confirmedAccount('locked', 'buyer', 'the-right-password');
  for (let attempt = 1; attempt <= MAX_FAILURES_PER_EMAIL; attempt += 1) {
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
