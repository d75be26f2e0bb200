// Shared steps of the integration tests. They talk to the services `npm test` started.
import { randomUUID } from 'node:crypto';
import { expect } from 'vitest';
import { listCaughtMail, type CaughtMail } from '@/lib/platform/mail-sink';

/** An address no other test uses, so tests never see each other's accounts or mail. */
export function uniqueEmail(label: string) {
  return `${label}-${randomUUID().slice(0, 8)}@tests.example`;
}

export async function mailTo(address: string): Promise<CaughtMail[]> {
  return listCaughtMail({ to: address });
}

/** The one message sent to the address, which must exist. */
export async function onlyMailTo(address: string): Promise<CaughtMail> {
  const messages = await mailTo(address);
  expect(messages, `mail to ${address}`).toHaveLength(1);
  return messages[0];
}

/** The token of the link to `path` in a message's text. */
export function tokenFromLink(mail: CaughtMail, path: '/verify-email' | '/reset-password'): string {
  const match = mail.text.match(new RegExp(`https?://\\S+${path}\\?token=([A-Za-z0-9_-]+)`));
  if (!match) throw new Error(`no ${path} link in the mail "${mail.subject}"`);
  return match[1];
}

export function jsonRequest(url: string, body: unknown) {
  return new Request(`http://127.0.0.1${url}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });
}
