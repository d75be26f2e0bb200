'use client';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/client/api';
import { emailOnlySchema } from '@/lib/validation/account';
import type { ResendVerificationResponse } from '@/app/api/account/verification/route';

export function ResendVerificationForm({ email = '' }: { email?: string }) {
  const form = useValidatedForm(emailOnlySchema);
  const [state, setState] = useState<{ sentTo?: string; failure?: string; busy: boolean }>({ busy: false });

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = form.validate(event.currentTarget);
    if (!input) return;
    setState({ busy: true });
    const outcome = await postJson<ResendVerificationResponse>('/api/account/verification', input);
    if (outcome.ok) return setState({ busy: false, sentTo: outcome.data.email });
    if (outcome.error.fields) form.setErrors(outcome.error.fields);
    setState({ busy: false, failure: outcome.error.message });
  }

  if (state.sentTo) {
    return (
      <Notice tone="success">
        If an unconfirmed account uses <strong>{state.sentTo}</strong>, a new confirmation link is on its way.
      </Notice>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3">
      {state.failure && <Notice tone="error">{state.failure}</Notice>}
      <TextField label="E-mail address for a new link" type="email" autoComplete="email" defaultValue={email} {...form.field('email')} />
      <Button type="submit" look="quiet" disabled={!form.ready || state.busy}>
        {state.busy ? 'Sending…' : 'Send a new confirmation link'}
      </Button>
    </form>
  );
}
