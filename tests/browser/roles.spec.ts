import { expect, test } from '@playwright/test';
import { DEMO_ACCOUNTS } from '../../db/demo-scenario';
import { expectSignedInAs, pageStatus, signInThroughForm } from './helpers';

const demo = (role: 'groomer' | 'buyer' | 'admin') => DEMO_ACCOUNTS.find((account) => account.roles.includes(role))!;

test('a buyer is refused the seller’s and admin’s pages with a 403 page, and has a studio of their own', async ({ page }) => {
  const buyer = demo('buyer');
  await signInThroughForm(page, buyer.email, buyer.password);
  await expectSignedInAs(page, buyer.displayName);
  // Signed in without a page to come back to, a buyer lands on the market.
  await expect(page).toHaveURL(/\/market$/);

  const nav = page.getByRole('navigation', { name: 'Areas' });
  await expect(nav.getByRole('link', { name: 'Library' })).toBeVisible();
  await expect(nav.getByRole('link', { name: 'Studio' })).toBeVisible();
  await expect(nav.getByRole('link', { name: 'Sales' })).toHaveCount(0);
  expect((await page.goto('/studio'))?.status()).toBe(200);

  for (const path of ['/sales', '/sales/new', '/admin/mail']) {
    const response = await page.goto(path);
    expect(response?.status(), path).toBe(403);
    await expect(page.getByRole('heading', { name: 'This page is not open to your account' })).toBeVisible();
    await expect(page.getByText('You are signed in as buyer')).toBeVisible();
  }

  const api = await page.request.get('/api/admin/mail');
  expect(api.status()).toBe(403);
  expect((await api.json()).error.code).toBe('forbidden');
});

test('visitors are sent to sign in first, and come back afterwards', async ({ page }) => {
  await page.goto('/sales');
  await expect(page).toHaveURL(/\/signin\?callbackUrl=%2Fsales$/);
  const groomer = demo('groomer');
  await page.getByLabel('E-mail address').fill(groomer.email);
  await page.getByLabel('Password').fill(groomer.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).toHaveURL(/\/sales$/);
  await expect(page.getByRole('heading', { name: 'Sales', level: 1 })).toBeVisible();
});

test('a groomer signing in from the sign-in page lands in the studio', async ({ page }) => {
  const groomer = demo('groomer');
  await signInThroughForm(page, groomer.email, groomer.password);
  await expect(page).toHaveURL(/\/studio$/);
  await expectSignedInAs(page, groomer.displayName);
});

test('the admin reads the outgoing mail', async ({ page }) => {
  const admin = demo('admin');
  // Something to read: a reset link for the admin's own address.
  await page.goto('/forgot-password');
  await page.getByLabel('E-mail address').fill(admin.email);
  await page.getByRole('button', { name: 'Send me a reset link' }).click();
  await expect(pageStatus(page)).toBeVisible();

  await signInThroughForm(page, admin.email, admin.password);
  await expectSignedInAs(page, admin.displayName);
  await page.goto('/admin');
  await page.getByRole('link', { name: /Outgoing mail/ }).click();
  const mail = page.getByTestId('caught-mail').filter({ hasText: admin.email }).first();
  await expect(mail).toContainText('Choose a new Whorlwind password');
  await expect(mail).toContainText('/reset-password?token=');
});

test('the landing page says what Whorlwind is for', async ({ page }) => {
  await page.goto('/');
  await expect(page.getByRole('heading', { level: 1 })).toHaveText(/Decide which way the fur lies/);
  await expect(page.getByRole('img', { name: /whorl/ })).toBeVisible();
  await expect(page.getByRole('navigation', { name: 'Areas' }).getByRole('link')).toHaveText(['Market']);
});
