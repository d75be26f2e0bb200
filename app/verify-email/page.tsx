// Opened from the confirmation e-mail: confirms the address the token was sent to.
import type { Metadata } from 'next';
import Link from 'next/link';
import { AccountPanel } from '@/components/account/AccountPanel';
import { ResendVerificationForm } from '@/components/account/ResendVerificationForm';
import { Notice } from '@/components/ui/Notice';
import { TOKEN_PROBLEM_MESSAGES, verifyEmail, type VerifyEmailResult } from '@/lib/accounts/users';
import { tokenField } from '@/lib/accounts/schemas';

export const metadata: Metadata = { title: 'Confirm your e-mail address' };

export default async function VerifyEmailPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const token = tokenField.safeParse((await searchParams).token);
  const result: VerifyEmailResult = token.success ? await verifyEmail(token.data) : { ok: false, problem: 'invalid-token' };

  if (result.ok) {
    return (
      <AccountPanel title="Your address is confirmed">
        <Notice tone="success">
          <strong>{result.email}</strong> is confirmed. Welcome to Whorlwind.
        </Notice>
        <Link href="/signin" className="self-start rounded-full bg-bracken px-5 py-2.5 font-semibold text-chalk no-underline hover:bg-bracken-deep">
          Sign in
        </Link>
      </AccountPanel>
    );
  }
  return (
    <AccountPanel title="This link did not work">
      <Notice tone={result.problem === 'used-token' ? 'info' : 'error'}>{TOKEN_PROBLEM_MESSAGES['verify-email'][result.problem]}</Notice>
      {result.problem === 'used-token' ? (
        <Link href="/signin" className="font-semibold text-tarn">
          Sign in
        </Link>
      ) : (
        <ResendVerificationForm />
      )}
    </AccountPanel>
  );
}
