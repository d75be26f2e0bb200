'use client';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/http/client';
import { emailOnlySchema } from '@/lib/accounts/schemas';
import type { PasswordResetRequestResponse } from '@/lib/accounts/types';

export function ForgotPasswordForm() {
  const form = useValidatedForm(emailOnlySchema);
  const [sentTo, setSentTo] = useState<string | null>(null);

  if (sentTo) {
    return (
      <Notice tone="success">
        If an account uses <strong>{sentTo}</strong>, a link to choose a new password is on its way. It works for one hour.
      </Notice>
    );
  }
  return (
    <form
      noValidate
      className="flex flex-col gap-4"
      onSubmit={form.onSubmit(async (input) => {
        const outcome = await postJson<PasswordResetRequestResponse>('/api/account/password-reset', input);
        if (!outcome.ok) return outcome.error;
        setSentTo(outcome.data.email);
      })}
    >
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      <TextField label="E-mail address" type="email" autoComplete="email" {...form.field('email')} />
      <Button type="submit" disabled={!form.ready || form.busy}>
        {form.busy ? 'Sending…' : 'Send me a reset link'}
      </Button>
    </form>
  );
}
