// The e-mail the local SMTP sink caught, for admins.
import { requireApiRoles } from '@/lib/accounts/session';
import { jsonData, jsonError } from '@/lib/http/server';
import { listCaughtMail, mailSinkConfigured, MailSinkUnavailable, type CaughtMail } from '@/lib/platform/mail-sink';

export type CaughtMailResponse = { configured: false } | { configured: true; messages: CaughtMail[] };

export async function GET() {
  const access = await requireApiRoles(['admin']);
  if (!access.ok) return access.response;
  if (!mailSinkConfigured()) return jsonData<CaughtMailResponse>({ configured: false });
  try {
    return jsonData<CaughtMailResponse>({ configured: true, messages: await listCaughtMail() });
  } catch (error) {
    if (error instanceof MailSinkUnavailable) return jsonError(503, 'service-unavailable', error.message);
    throw error;
  }
}
