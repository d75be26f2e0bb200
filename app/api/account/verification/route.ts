// Sends a new confirmation link. The answer is the same whether or not an unconfirmed account
// has the address, so the form cannot be used to find out who has an account.
import { resendVerification } from '@/lib/accounts/users';
import { MailNotSent } from '@/lib/platform/mail';
import { jsonData, jsonError, readJson } from '@/lib/http/server';
import { emailOnlySchema } from '@/lib/accounts/schemas';

export type ResendVerificationResponse = { email: string };

export async function POST(request: Request) {
  const input = await readJson(request, emailOnlySchema);
  if (!input.ok) return input.response;
  try {
    await resendVerification(input.value.email);
    return jsonData<ResendVerificationResponse>({ email: input.value.email });
  } catch (error) {
    if (error instanceof MailNotSent) return jsonError(502, 'mail-failed', 'The e-mail could not be sent. Try again in a moment.');
    throw error;
  }
}
