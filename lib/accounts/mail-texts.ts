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
