// Sends a password reset link; answers the same whether or not the address has an account.
import { requestPasswordReset } from '@/lib/accounts/users';
import { MailNotSent } from '@/lib/platform/mail';
import { jsonData, jsonError, readJson } from '@/lib/http/server';
import { emailOnlySchema } from '@/lib/accounts/schemas';

export type PasswordResetRequestResponse = { email: string };

export async function POST(request: Request) {
  const input = await readJson(request, emailOnlySchema);
  if (!input.ok) return input.response;
  try {
    await requestPasswordReset(input.value.email);
    return jsonData<PasswordResetRequestResponse>({ email: input.value.email });
  } catch (error) {
    if (error instanceof MailNotSent) return jsonError(502, 'mail-failed', 'The e-mail could not be sent. Try again in a moment.');
    throw error;
  }
}
