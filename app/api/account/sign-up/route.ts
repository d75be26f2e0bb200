// Signs up. The answer is the same whether or not the address has an account (the mail differs:
// lib/accounts/users.ts), so the form cannot be used to find out who has one.
import { clientAddressOf } from '@/lib/accounts/client-address';
import { TOO_MANY_MAIL_REQUESTS } from '@/lib/accounts/mail-limits';
import type { SignUpResponse } from '@/lib/accounts/types';
import { signUp } from '@/lib/accounts/users';
import { signUpSchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';
import { MailNotSent } from '@/lib/platform/mail';

export function POST(request: Request) {
  return handler('none', async () => {
    const input = await readBody(request, signUpSchema);
    let result: Awaited<ReturnType<typeof signUp>>;
    try {
      result = await signUp(input, clientAddressOf(request.headers));
    } catch (error) {
      if (error instanceof MailNotSent) {
        throw new HttpError(502, 'mail-failed', 'The confirmation e-mail could not be sent, so no account was created. Try again in a moment.');
      }
      throw error;
    }
    if (!result.ok) throw new HttpError(429, 'too-many-requests', TOO_MANY_MAIL_REQUESTS);
    return jsonData<SignUpResponse>({ email: result.email }, 201);
  });
}
