import type { Metadata } from 'next';
import { AccountPanel } from '@/components/account/AccountPanel';
import { SignUpForm } from '@/components/account/SignUpForm';

export const metadata: Metadata = { title: 'Create an account' };

export default function SignUpPage() {
  return (
    <AccountPanel title="Create an account" intro="We will send you a link to confirm your e-mail address.">
      <SignUpForm />
    </AccountPanel>
  );
}
