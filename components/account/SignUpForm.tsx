'use client';
import Link from 'next/link';
import { useState } from 'react';
import { Button } from '@/components/ui/Button';
import { AGE_NOTE } from '@/lib/market/vocabulary';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { postJson } from '@/lib/http/client';
import { PASSWORD_MIN_LENGTH, signUpSchema } from '@/lib/accounts/schemas';
import type { SignUpResponse } from '@/lib/accounts/types';

const ROLE_CHOICES = [
  { value: 'groomer', title: 'I groom', text: 'Build coats in the studio, sell presets — and buy them too.' },
  { value: 'buyer', title: 'I buy', text: 'Find presets on the market and download what you bought.' },
] as const;

export function SignUpForm() {
  const form = useValidatedForm(signUpSchema);
  const [sentTo, setSentTo] = useState<string | null>(null);

  if (sentTo) {
    return (
      <Notice tone="success">
        Almost there: we sent an e-mail to <strong>{sentTo}</strong>. Open the link in it to confirm your address, then sign in.
      </Notice>
    );
  }

  return (
    <form
      noValidate
      className="flex flex-col gap-4"
      onSubmit={form.onSubmit(async (input) => {
        const outcome = await postJson<SignUpResponse>('/api/account/sign-up', input);
        if (!outcome.ok) return outcome.error;
        setSentTo(outcome.data.email);
      })}
    >
      {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
      <TextField label="Your name" autoComplete="name" {...form.field('displayName')} />
      <TextField label="E-mail address" type="email" autoComplete="email" {...form.field('email')} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
        {...form.field('password')}
      />
      <fieldset className="flex flex-col gap-2" aria-describedby={form.errors.role ? 'role-error' : undefined}>
        <legend className="pb-1.5 text-sm font-semibold">How you will use Whorlwind</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {ROLE_CHOICES.map((choice) => (
            <label
              key={choice.value}
              className="flex cursor-pointer flex-col gap-1 rounded-2xl border-2 border-vellum bg-white p-3 has-[:checked]:border-bracken"
            >
              <span className="flex items-center gap-2 font-semibold">
                <input
                  type="radio"
                  name="role"
                  value={choice.value}
                  onChange={() => form.clearError('role')}
                  className="accent-bracken"
                />
                {choice.title}
              </span>
              <span className="text-sm text-loam-soft">{choice.text}</span>
            </label>
          ))}
        </div>
        {form.errors.role && (
          <p id="role-error" className="text-sm font-medium text-hawthorn" data-field-error="role">
            {form.errors.role}
          </p>
        )}
      </fieldset>
      <p className="text-sm text-loam-soft" data-testid="age-note">
        {AGE_NOTE}
      </p>
      <Button type="submit" disabled={!form.ready || form.busy}>
        {form.busy ? 'Creating your account…' : 'Create my account'}
      </Button>
      <p className="text-sm text-loam-soft">
        Already have an account?{' '}
        <Link href="/signin" className="font-semibold text-tarn">
          Sign in
        </Link>
      </p>
    </form>
  );
}
