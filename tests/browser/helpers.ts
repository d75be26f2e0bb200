// Steps the browser tests share. Accounts are made and mail is read through the app's own
// server-side modules, against the same PostgreSQL and mail sink the app under test uses.
import { randomUUID } from 'node:crypto';
import { expect, type Page } from '@playwright/test';
import { signUp, verifyEmail } from '../../lib/accounts/users';
import { listCaughtMail, type CaughtMail } from '../../lib/platform/mail-sink';
import type { Role } from '../../lib/accounts/roles';

export function uniqueEmail(label: string) {
  return `${label}-${randomUUID().slice(0, 8)}@browser.example`;
}

export async function newestMailTo(address: string): Promise<CaughtMail> {
  const [newest] = await listCaughtMail({ to: address });
  if (!newest) throw new Error(`no mail was sent to ${address}`);
  return newest;
}

/** The path and query of the link to `path` in the newest mail to the address. */
export async function linkFromNewestMail(address: string, path: '/verify-email' | '/reset-password'): Promise<string> {
  const mail = await newestMailTo(address);
  const match = mail.text.match(new RegExp(`https?://[^/\\s]+(${path}\\?token=[A-Za-z0-9_-]+)`));
  if (!match) throw new Error(`no ${path} link in "${mail.subject}"`);
  return match[1];
}

export async function confirmedAccount(label: string, role: Extract<Role, 'groomer' | 'buyer'>, password: string) {
  const email = uniqueEmail(label);
  const displayName = `Test ${label}`;
  await signUp({ displayName, email, password, role });
  const token = new URL(`http://x${await linkFromNewestMail(email, '/verify-email')}`).searchParams.get('token')!;
  await verifyEmail(token);
  return { email, displayName, password };
}

export async function signInThroughForm(page: Page, email: string, password: string) {
  await page.goto('/signin');
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

export async function expectSignedInAs(page: Page, displayName: string) {
  await expect(page.getByTestId('signed-in-as')).toContainText(displayName);
}

/** The page's own alert (Next.js keeps an empty one of its own for route announcements). */
export function pageAlert(page: Page) {
  return page.getByRole('main').getByRole('alert');
}

export function pageStatus(page: Page) {
  return page.getByRole('main').getByRole('status');
}
