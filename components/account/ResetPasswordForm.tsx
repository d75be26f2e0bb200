'use client';
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/http/client';
import { PASSWORD_MIN_LENGTH, resetPasswordSchema } from '@/lib/accounts/schemas';
import type { ApiErrorCode } from '@/lib/http/types';
import type { PasswordResetConfirmResponse } from '@/lib/accounts/types';

const TOKEN_PROBLEMS: ApiErrorCode[] = ['invalid-token', 'expired-token', 'used-token'];

export function ResetPasswordForm({ token }: { token: string }) {
  const form = useValidatedForm(resetPasswordSchema);
  const [changedFor, setChangedFor] = useState<string | null>(null);
  const [linkUnusable, setLinkUnusable] = useState(false);

  if (changedFor) {
    return (
      <Notice tone="success">
        The password of <strong>{changedFor}</strong> is changed.{' '}
        <Link href="/signin" className="font-semibold">
          Sign in with it
        </Link>
        .
      </Notice>
    );
  }
  return (
    <form
      noValidate
      className="flex flex-col gap-4"
      onSubmit={form.onSubmit(async (input) => {
        const outcome = await postJson<PasswordResetConfirmResponse>('/api/account/password-reset/confirm', input);
        if (!outcome.ok) {
          setLinkUnusable(TOKEN_PROBLEMS.includes(outcome.error.code));
          return outcome.error;
        }
        setChangedFor(outcome.data.email);
      })}
    >
      {form.failure && (
        <Notice tone="error">
          {form.failure.message}{' '}
          {linkUnusable && (
            <Link href="/forgot-password" className="font-semibold">
              Ask for a new link
            </Link>
          )}
        </Notice>
      )}
      <input type="hidden" name="token" value={token} />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
        {...form.field('password')}
      />
      <Button type="submit" disabled={!form.ready || form.busy}>
        {form.busy ? 'Saving…' : 'Save the new password'}
      </Button>
    </form>
  );
}
