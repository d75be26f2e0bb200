// Sends a new confirmation link. The answer is the same whether or not an unconfirmed account
// has the address, so the form cannot be used to find out who has an account.
import { clientAddressOf } from '@/lib/accounts/client-address';
import { TOO_MANY_MAIL_REQUESTS } from '@/lib/accounts/mail-limits';
import type { ResendVerificationResponse } from '@/lib/accounts/types';
import { resendVerification } from '@/lib/accounts/users';
import { emailOnlySchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';
import { MailNotSent } from '@/lib/platform/mail';

export function POST(request: Request) {
  return handler('none', async () => {
    const { email } = await readBody(request, emailOnlySchema);
    let result: Awaited<ReturnType<typeof resendVerification>>;
    try {
      result = await resendVerification(email, clientAddressOf(request.headers));
    } catch (error) {
      if (error instanceof MailNotSent) throw new HttpError(502, 'mail-failed', 'The e-mail could not be sent. Try again in a moment.');
      throw error;
    }
    if (!result.ok) throw new HttpError(429, 'too-many-requests', TOO_MANY_MAIL_REQUESTS);
    return jsonData<ResendVerificationResponse>({ email });
  });
}
