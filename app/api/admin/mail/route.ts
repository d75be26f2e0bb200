// The e-mail the local SMTP sink caught, for admins.
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData } from '@/lib/http/server';
import { listCaughtMail, mailSinkConfigured, MailSinkUnavailable } from '@/lib/platform/mail-sink';
import type { CaughtMailResponse } from '@/lib/platform/types';

export function GET() {
  return handler(['admin'], async () => {
    if (!mailSinkConfigured()) return jsonData<CaughtMailResponse>({ configured: false });
    try {
      return jsonData<CaughtMailResponse>({ configured: true, messages: await listCaughtMail() });
    } catch (error) {
      if (error instanceof MailSinkUnavailable) throw new HttpError(503, 'service-unavailable', error.message);
      throw error;
    }
  });
}
