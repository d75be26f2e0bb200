// Sends a password reset link; answers the same whether or not the address has an account.
import type { PasswordResetRequestResponse } from '@/lib/accounts/types';
import { requestPasswordReset } from '@/lib/accounts/users';
import { emailOnlySchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';
import { MailNotSent } from '@/lib/platform/mail';

export function POST(request: Request) {
  return handler('none', async () => {
    const { email } = await readBody(request, emailOnlySchema);
    try {
      await requestPasswordReset(email);
    } catch (error) {
      if (error instanceof MailNotSent) throw new HttpError(502, 'mail-failed', 'The e-mail could not be sent. Try again in a moment.');
      throw error;
    }
    return jsonData<PasswordResetRequestResponse>({ email });
  });
}
