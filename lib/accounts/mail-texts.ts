// The texts of the account e-mails. Links are absolute, built on NEXTAUTH_URL.
import { env } from '../platform/env';
import { escapeHtml } from '../platform/html';
import type { OutgoingMail } from '../platform/mail';

function link(path: string, token: string) {
  const url = new URL(path, env().NEXTAUTH_URL);
  url.searchParams.set('token', token);
  return url.toString();
}

export function verificationMail(to: string, displayName: string, token: string): OutgoingMail {
  const url = link('/verify-email', token);
  return {
    to,
    subject: 'Confirm your e-mail address for Whorlwind',
    text: `Hello ${displayName},\n\nopen this link to confirm your e-mail address and start using Whorlwind:\n\n${url}\n\nThe link works once, for 24 hours. If you did not sign up, ignore this message.\n`,
    html: `<p>Hello ${escapeHtml(displayName)},</p><p>open this link to confirm your e-mail address and start using Whorlwind:</p><p><a href="${escapeHtml(url)}">${escapeHtml(url)}</a></p><p>The link works once, for 24 hours. If you did not sign up, ignore this message.</p>`,
  };
}

export function passwordResetMail(to: string, displayName: string, token: string): OutgoingMail {
  const url = link('/reset-password', token);
  return {
    to,
    subject: 'Choose a new Whorlwind password',
    text: `Hello ${displayName},\n\nsomeone asked to reset the password of your Whorlwind account. To choose a new one, open:\n\n${url}\n\nThe link works once, for 1 hour. If it was not you, ignore this message: your password stays as it is.\n`,
    html: `<p>Hello ${escapeHtml(displayName)},</p><p>someone asked to reset the password of your Whorlwind account. To choose a new one, open:</p><p><a href="${escapeHtml(url)}">${escapeHtml(url)}</a></p><p>The link works once, for 1 hour. If it was not you, ignore this message: your password stays as it is.</p>`,
  };
}

/** To the owner of a confirmed address that someone used to sign up again (sign-up answers the same for every address). */
export function signUpAttemptMail(to: string, displayName: string): OutgoingMail {
  const signIn = new URL('/signin', env().NEXTAUTH_URL).toString();
  const forgot = new URL('/forgot-password', env().NEXTAUTH_URL).toString();
  return {
    to,
    subject: 'Someone tried to sign up to Whorlwind with your address',
    text: `Hello ${displayName},\n\nsomeone tried to create a new Whorlwind account with this e-mail address, which already has one: yours. No new account was made.\n\nIf it was you, sign in instead:\n\n${signIn}\n\nForgot your password? Choose a new one here:\n\n${forgot}\n\nIf it was not you, ignore this message: nothing changed.\n`,
    html: `<p>Hello ${escapeHtml(displayName)},</p><p>someone tried to create a new Whorlwind account with this e-mail address, which already has one: yours. No new account was made.</p><p>If it was you, <a href="${escapeHtml(signIn)}">sign in</a> instead. Forgot your password? <a href="${escapeHtml(forgot)}">Choose a new one</a>.</p><p>If it was not you, ignore this message: nothing changed.</p>`,
  };
}
