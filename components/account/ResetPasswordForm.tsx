'use client';
import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/client/api';
import { PASSWORD_MIN_LENGTH, resetPasswordSchema } from '@/lib/validation/account';
import type { PasswordResetConfirmResponse } from '@/app/api/account/password-reset/confirm/route';

export function ResetPasswordForm({ token }: { token: string }) {
  const form = useValidatedForm(resetPasswordSchema);
  const [failure, setFailure] = useState<{ message: string; tokenProblem: boolean } | null>(null);
  const [changedFor, setChangedFor] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = form.validate(event.currentTarget);
    if (!input) return;
    setBusy(true);
    setFailure(null);
    const outcome = await postJson<PasswordResetConfirmResponse>('/api/account/password-reset/confirm', input);
    setBusy(false);
    if (outcome.ok) return setChangedFor(outcome.data.email);
    if (outcome.error.fields) form.setErrors(outcome.error.fields);
    const tokenProblem = ['invalid-token', 'expired-token', 'used-token'].includes(outcome.error.code) || Boolean(outcome.error.fields?.token);
    setFailure({ message: outcome.error.fields?.token ?? outcome.error.message, tokenProblem });
  }

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
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      {failure && (
        <Notice tone="error">
          {failure.message}{' '}
          {failure.tokenProblem && (
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
      <Button type="submit" disabled={!form.ready || busy}>
        {busy ? 'Saving…' : 'Save the new password'}
      </Button>
    </form>
  );
}
