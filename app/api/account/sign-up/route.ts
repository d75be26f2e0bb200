// Creates an account and sends its confirmation link; without the mail, no account is kept.
import type { SignUpResponse } from '@/lib/accounts/types';
import { signUp } from '@/lib/accounts/users';
import { signUpSchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';
import { MailNotSent } from '@/lib/platform/mail';

const EMAIL_TAKEN = 'An account already uses this e-mail address. Sign in, or reset its password.';

export function POST(request: Request) {
  return handler('none', async () => {
    const input = await readBody(request, signUpSchema);
    let result: Awaited<ReturnType<typeof signUp>>;
    try {
      result = await signUp(input);
    } catch (error) {
      if (error instanceof MailNotSent) {
        throw new HttpError(502, 'mail-failed', 'The confirmation e-mail could not be sent, so no account was created. Try again in a moment.');
      }
      throw error;
    }
    if (!result.ok) throw new HttpError(409, 'email-taken', EMAIL_TAKEN, { fields: { email: EMAIL_TAKEN } });
    return jsonData<SignUpResponse>({ email: result.email }, 201);
  });
}
