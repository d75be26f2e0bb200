// Local stand-in for the outgoing mail service: an SMTP server that accepts every message,
// keeps it in memory and shows it over a small HTTP JSON endpoint, which the admin mail page
// (through lib/mail-sink.ts) and the tests read. The app sends to it with nodemailer over SMTP.
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { randomUUID } from 'node:crypto';

export type CaughtMail = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
};

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

  const http = createServer((request: IncomingMessage, response: ServerResponse) => {
    const url = new URL(request.url ?? '/', 'http://sink');
    const reply = (status: number, body: unknown) => {
      response.writeHead(status, { 'content-type': 'application/json' });
      response.end(JSON.stringify(body));
    };
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

  await new Promise<void>((resolve, reject) => {
    smtp.on('error', reject);
    smtp.listen(smtpPort, '127.0.0.1', () => resolve());
  });
  await new Promise<void>((resolve, reject) => {
    http.on('error', reject);
    http.listen(httpPort, '127.0.0.1', () => resolve());
  });

  return {
    url: `http://127.0.0.1:${httpPort}`,
    close: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      http.closeAllConnections();
      await new Promise<void>((resolve) => http.close(() => resolve()));
    },
  };
}
