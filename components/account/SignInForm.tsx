'use client';
import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { signIn } from 'next-auth/react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { isSignInProblem, SIGN_IN_PROBLEM_MESSAGES, type SignInProblem } from '@/lib/sign-in-problems';
import { signInSchema } from '@/lib/validation/account';
import { ResendVerificationForm } from './ResendVerificationForm';

type Failure = { problem: SignInProblem | null; message: string; email: string };

export function SignInForm({ callbackUrl }: { callbackUrl: string }) {
  const form = useValidatedForm(signInSchema);
  const [failure, setFailure] = useState<Failure | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = form.validate(event.currentTarget);
    if (!input) return;
    setBusy(true);
    setFailure(null);
    const result = await signIn('credentials', { redirect: false, email: input.email, password: input.password, callbackUrl });
    if (result?.ok && !result.error) {
      // A full load, so the server-rendered header shows the signed-in state at once.
      window.location.assign(callbackUrl);
      return;
    }
    setBusy(false);
    const code = result?.error;
    setFailure(
      isSignInProblem(code)
        ? { problem: code, message: SIGN_IN_PROBLEM_MESSAGES[code], email: input.email }
        : { problem: null, message: `Signing in failed${code ? ` (${code})` : ''}. Try again in a moment.`, email: input.email },
    );
  }

  return (
    <div className="flex flex-col gap-5">
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        {failure && <Notice tone="error">{failure.message}</Notice>}
        <TextField label="E-mail address" type="email" autoComplete="email" {...form.field('email')} />
        <TextField label="Password" type="password" autoComplete="current-password" {...form.field('password')} />
        <Button type="submit" disabled={!form.ready || busy}>
          {busy ? 'Signing in…' : 'Sign in'}
        </Button>
      </form>
      {failure?.problem === 'email-not-verified' && <ResendVerificationForm email={failure.email} />}
      <div className="flex flex-wrap justify-between gap-2 text-sm">
        <Link href="/forgot-password" className="font-semibold text-tarn">
          Forgot your password?
        </Link>
        <Link href="/signup" className="font-semibold text-tarn">
          Create an account
        </Link>
      </div>
    </div>
  );
}
