// Reads what the local SMTP sink caught (its HTTP JSON endpoint at MAIL_SINK_URL), for the
// admin mail page and the tests. Where MAIL_SINK_URL is empty, mail goes to a real service
// and there is nothing to read here.
import { z } from 'zod';
import { env } from './env';

export const caughtMailSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
});
export type CaughtMail = z.infer<typeof caughtMailSchema>;

const listSchema = z.object({ messages: z.array(caughtMailSchema) });

export class MailSinkUnavailable extends Error {}

export function mailSinkConfigured(): boolean {
  return env().MAIL_SINK_URL !== '';
}

/** The caught messages, newest first, optionally only those sent to one address. */
export async function listCaughtMail(options: { to?: string } = {}): Promise<CaughtMail[]> {
  const base = env().MAIL_SINK_URL;
  if (base === '') throw new MailSinkUnavailable('No mail sink is configured (MAIL_SINK_URL is empty).');
  const url = new URL('/messages', base);
  if (options.to) url.searchParams.set('to', options.to);
  let response: Response;
  try {
    response = await fetch(url, { cache: 'no-store', signal: AbortSignal.timeout(5_000) });
  } catch (error) {
    throw new MailSinkUnavailable(`The mail sink at ${base} did not answer: ${(error as Error).message}`);
  }
  if (!response.ok) throw new MailSinkUnavailable(`The mail sink at ${base} answered ${response.status}.`);
  return listSchema.parse(await response.json()).messages;
}
