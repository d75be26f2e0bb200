import type { Metadata } from 'next';
import { AccountPanel } from '@/components/account/AccountPanel';
import { ForgotPasswordForm } from '@/components/account/ForgotPasswordForm';

export const metadata: Metadata = { title: 'Forgot your password' };

export default function ForgotPasswordPage() {
  return (
    <AccountPanel title="Forgot your password?" intro="Tell us the address you signed up with and we will mail you a link to choose a new one.">
      <ForgotPasswordForm />
    </AccountPanel>
  );
}
