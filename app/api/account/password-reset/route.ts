// Sends a password reset link; answers the same whether or not the address has an account.
import { clientAddressOf } from '@/lib/accounts/client-address';
import { TOO_MANY_MAIL_REQUESTS } from '@/lib/accounts/mail-limits';
import type { PasswordResetRequestResponse } from '@/lib/accounts/types';
import { requestPasswordReset } from '@/lib/accounts/users';
import { emailOnlySchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';
import { MailNotSent } from '@/lib/platform/mail';

export function POST(request: Request) {
  return handler('none', async () => {
    const { email } = await readBody(request, emailOnlySchema);
    let result: Awaited<ReturnType<typeof requestPasswordReset>>;
    try {
      result = await requestPasswordReset(email, clientAddressOf(request.headers));
    } catch (error) {
      if (error instanceof MailNotSent) throw new HttpError(502, 'mail-failed', 'The e-mail could not be sent. Try again in a moment.');
      throw error;
    }
    if (!result.ok) throw new HttpError(429, 'too-many-requests', TOO_MANY_MAIL_REQUESTS);
    return jsonData<PasswordResetRequestResponse>({ email });
  });
}
