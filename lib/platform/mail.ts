// Outgoing e-mail over SMTP with nodemailer. Locally the SMTP sink receives it
// (services/smtp-sink.ts); production points SMTP_* at a real mail service.
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from './env';

export type OutgoingMail = { to: string; subject: string; text: string; html: string };

let transporter: Transporter | undefined;

function transport(): Transporter {
  if (!transporter) {
    const config = env();
    transporter = nodemailer.createTransport({
      host: config.SMTP_HOST,
      port: config.SMTP_PORT,
      secure: config.SMTP_SECURE,
      auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
      connectionTimeout: 10_000,
    });
  }
  return transporter;
}

export class MailNotSent extends Error {}

export async function sendMail(mail: OutgoingMail) {
  try {
    await transport().sendMail({ from: env().MAIL_FROM, ...mail });
  } catch (error) {
    throw new MailNotSent(`The e-mail to ${mail.to} could not be sent: ${(error as Error).message}`);
  }
}
