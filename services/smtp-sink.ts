// Local stand-in for the outgoing mail service: an SMTP server that accepts every message,
// keeps it in memory and shows it over a small HTTP JSON endpoint, which the admin mail page
// and the tests read through lib/platform/mail-sink.ts (where the shape of a message is defined).
// The app sends to it with nodemailer over SMTP.
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { randomUUID } from 'node:crypto';
import type { CaughtMail } from '../lib/platform/mail-sink';
import { serveJson } from './json-http';

export type SmtpSinkOptions = { smtpPort: number; httpPort: number };

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((entry) => entry.value.map((mailbox) => mailbox.address ?? '')).filter(Boolean);
}

export async function startSmtpSink({ smtpPort, httpPort }: SmtpSinkOptions) {
  const messages: CaughtMail[] = [];

  const smtp = new SMTPServer({
    authOptional: true,
    // The certificate bundled with smtp-server has expired; the sink only listens on loopback.
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const envelopeRecipients = session.envelope.rcptTo.map((recipient) => recipient.address);
          messages.unshift({
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: addresses(parsed.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: envelopeRecipients.length > 0 ? envelopeRecipients : addresses(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
          });
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });

  await new Promise<void>((resolve, reject) => {
    smtp.on('error', reject);
    smtp.listen(smtpPort, '127.0.0.1', () => resolve());
  });

  const http = await serveJson(httpPort, (request, url, reply) => {
    if (url.pathname === '/health') return reply(200, { ok: true });
    if (url.pathname !== '/messages') return reply(404, { error: `no such path: ${url.pathname}` });
    if (request.method === 'DELETE') {
      messages.length = 0;
      return reply(200, { messages: [] });
    }
    if (request.method !== 'GET') return reply(405, { error: `${request.method} is not supported on /messages` });
    const to = url.searchParams.get('to')?.toLowerCase();
    const selected = to ? messages.filter((mail) => mail.to.some((address) => address.toLowerCase() === to)) : messages;
    return reply(200, { messages: selected });
  });

  return {
    url: http.url,
    close: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await http.close();
    },
  };
}
