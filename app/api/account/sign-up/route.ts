import { signUp } from '@/lib/accounts/users';
import { MailNotSent } from '@/lib/platform/mail';
import { jsonData, jsonError, readJson } from '@/lib/http/server';
import { signUpSchema } from '@/lib/accounts/schemas';

export type SignUpResponse = { email: string };

export async function POST(request: Request) {
  const input = await readJson(request, signUpSchema);
  if (!input.ok) return input.response;
  try {
    const result = await signUp(input.value);
    if (!result.ok) {
      const message = 'An account already uses this e-mail address. Sign in, or reset its password.';
      return jsonError(409, 'email-taken', message, { email: message });
    }
    return jsonData<SignUpResponse>({ email: result.email }, 201);
  } catch (error) {
    if (error instanceof MailNotSent) {
      return jsonError(502, 'mail-failed', 'The confirmation e-mail could not be sent, so no account was created. Try again in a moment.');
    }
    throw error;
  }
}
