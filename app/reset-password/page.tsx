import type { Metadata } from 'next';
import Link from 'next/link';
import { AccountPanel } from '@/components/account/AccountPanel';
import { ResetPasswordForm } from '@/components/account/ResetPasswordForm';
import { Notice } from '@/components/ui/Notice';
import { tokenField } from '@/lib/accounts/schemas';

export const metadata: Metadata = { title: 'Choose a new password' };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const token = tokenField.safeParse((await searchParams).token);
  return (
    <AccountPanel title="Choose a new password">
      {token.success ? (
        <ResetPasswordForm token={token.data} />
      ) : (
        <Notice tone="error">
          {token.error.issues[0].message}{' '}
          <Link href="/forgot-password" className="font-semibold">
            Ask for a new link
          </Link>
        </Notice>
      )}
    </AccountPanel>
  );
}
