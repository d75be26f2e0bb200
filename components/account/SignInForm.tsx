'use client';
import Link from 'next/link';
import { useState } from 'react';
import { getSession, signIn } from 'next-auth/react';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { TextField } from '@/components/ui/TextField';
import { useValidatedForm } from '@/components/ui/use-validated-form';
import { isSignInProblem, SIGN_IN_PROBLEM_MESSAGES } from '@/lib/accounts/sign-in-problems';
import { signInSchema } from '@/lib/accounts/schemas';
import { homeAfterSignIn } from '@/lib/accounts/roles';
import { ResendVerificationForm } from './ResendVerificationForm';

/** `callbackUrl`: the page that sent the person here (checked by safeCallbackPath), or null: then where they work. */
export function SignInForm({ callbackUrl }: { callbackUrl: string | null }) {
  const form = useValidatedForm(signInSchema);
  // The address of an account that still needs confirming, to offer a new link for it.
  const [unconfirmedEmail, setUnconfirmedEmail] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-5">
      <form
        noValidate
        className="flex flex-col gap-4"
        onSubmit={form.onSubmit(async (input) => {
          setUnconfirmedEmail(null);
          const result = await signIn('credentials', { redirect: false, email: input.email, password: input.password, callbackUrl: callbackUrl ?? '/' });
          if (result?.ok && !result.error) {
            // A full load, so the server-rendered header shows the signed-in state at once.
            window.location.assign(callbackUrl ?? homeAfterSignIn((await getSession())?.user?.roles ?? []));
            return;
          }
          const code = result?.error;
          if (!isSignInProblem(code)) return { message: `Signing in failed${code ? ` (${code})` : ''}. Try again in a moment.` };
          if (code === 'email-not-verified') setUnconfirmedEmail(input.email);
          return { message: SIGN_IN_PROBLEM_MESSAGES[code] };
        })}
      >
        {form.failure && <Notice tone="error">{form.failure.message}</Notice>}
        <TextField label="E-mail address" type="email" autoComplete="email" {...form.field('email')} />
        <TextField label="Password" type="password" autoComplete="current-password" {...form.field('password')} />
        <Button type="submit" disabled={!form.ready || form.busy}>
          {form.busy ? 'Signing in…' : 'Sign in'}
        </Button>
      </form>
      {unconfirmedEmail && <ResendVerificationForm email={unconfirmedEmail} />}
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
