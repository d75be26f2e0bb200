// Sets a new password with the token from a reset link.
import type { PasswordResetConfirmResponse } from '@/lib/accounts/types';
import { resetPassword, TOKEN_PROBLEM_MESSAGES } from '@/lib/accounts/users';
import { resetPasswordSchema } from '@/lib/accounts/schemas';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, readBody } from '@/lib/http/server';

export function POST(request: Request) {
  return handler('none', async () => {
    const result = await resetPassword(await readBody(request, resetPasswordSchema));
    if (!result.ok) throw new HttpError(400, result.problem, TOKEN_PROBLEM_MESSAGES['reset-password'][result.problem]);
    return jsonData<PasswordResetConfirmResponse>({ email: result.email });
  });
}
