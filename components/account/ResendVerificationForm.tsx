'use client';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/http/client';
import { emailOnlySchema } from '@/lib/accounts/schemas';
import type { ResendVerificationResponse } from '@/lib/accounts/types';

export function ResendVerificationForm({ email = '' }: { email?: string }) {
  const form = useValidatedForm(emailOnlySchema);
  const [sentTo, setSentTo] = useState<string | null>(null);

  if (sentTo) {
    return (
      <Notice tone="success">
        If an unconfirmed account uses <strong>{sentTo}</strong>, a new confirmation link is on its way.
      </Notice>
    );
  }
  return (
    <form
      noValidate
      className="flex flex-col gap-3"
      onSubmit={form.onSubmit(async (input) => {
        const outcome = await postJson<ResendVerificationResponse>('/api/account/verification', input);
        if (!outcome.ok) return outcome.error;
        setSentTo(outcome.data.email);
      })}
    >
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      <TextField label="E-mail address for a new link" type="email" autoComplete="email" defaultValue={email} {...form.field('email')} />
      <Button type="submit" look="quiet" disabled={!form.ready || form.busy}>
        {form.busy ? 'Sending…' : 'Send a new confirmation link'}
      </Button>
    </form>
  );
}
