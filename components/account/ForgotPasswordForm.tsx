'use client';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/client/api';
import { emailOnlySchema } from '@/lib/validation/account';
import type { PasswordResetRequestResponse } from '@/app/api/account/password-reset/route';

export function ForgotPasswordForm() {
  const form = useValidatedForm(emailOnlySchema);
  const [failure, setFailure] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = form.validate(event.currentTarget);
    if (!input) return;
    setBusy(true);
    setFailure(null);
    const outcome = await postJson<PasswordResetRequestResponse>('/api/account/password-reset', input);
    setBusy(false);
    if (outcome.ok) return setSentTo(outcome.data.email);
    if (outcome.error.fields) form.setErrors(outcome.error.fields);
    setFailure(outcome.error.message);
  }

  if (sentTo) {
    return (
      <Notice tone="success">
        If an account uses <strong>{sentTo}</strong>, a link to choose a new password is on its way. It works for one hour.
      </Notice>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      {failure && <Notice tone="error">{failure}</Notice>}
      <TextField label="E-mail address" type="email" autoComplete="email" {...form.field('email')} />
      <Button type="submit" disabled={!form.ready || busy}>
        {busy ? 'Sending…' : 'Send me a reset link'}
      </Button>
    </form>
  );
}
