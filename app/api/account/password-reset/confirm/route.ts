import { resetPassword, TOKEN_PROBLEM_MESSAGES } from '@/lib/accounts/users';
import { jsonData, jsonError, readJson } from '@/lib/http/server';
import { resetPasswordSchema } from '@/lib/accounts/schemas';

export type PasswordResetConfirmResponse = { email: string };

export async function POST(request: Request) {
  const input = await readJson(request, resetPasswordSchema);
  if (!input.ok) return input.response;
  const result = await resetPassword(input.value);
  if (!result.ok) return jsonError(400, result.problem, TOKEN_PROBLEM_MESSAGES['reset-password'][result.problem]);
  return jsonData<PasswordResetConfirmResponse>({ email: result.email });
}
