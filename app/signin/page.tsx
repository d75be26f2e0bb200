import type { Metadata } from 'next';
import Link from 'next/link';
import { AccountPanel } from '@/components/account/AccountPanel';
import { SignInForm } from '@/components/account/SignInForm';
import { currentSession } from '@/lib/accounts/session';
import { safeCallbackPath } from '@/lib/accounts/safe-callback';
import { homeAfterSignIn } from '@/lib/accounts/roles';
import { env } from '@/lib/platform/env';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const callbackUrl = safeCallbackPath((await searchParams).callbackUrl, new URL(env().NEXTAUTH_URL).origin);
  const session = await currentSession();
  // Without a page to come back to, people land where they work (the studio for a groomer).
  const cameFrom = callbackUrl === '/' ? null : callbackUrl;
  if (session) {
    return (
      <AccountPanel title="You are signed in">
        <p>
          You are signed in as <strong>{session.user.email}</strong>.{' '}
          <Link href={cameFrom ?? homeAfterSignIn(session.user.roles)} className="font-semibold text-tarn">
            Continue
          </Link>
        </p>
      </AccountPanel>
    );
  }
  return (
    <AccountPanel title="Sign in" intro="Welcome back to the studio floor.">
      <SignInForm callbackUrl={cameFrom} />
    </AccountPanel>
  );
}
