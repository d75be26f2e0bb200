import type { Metadata } from 'next';
import { AccountAdmin } from '@/components/admin/AccountAdmin';
import { findAccounts } from '@/lib/accounts/admin-accounts';
import { requireArea } from '@/lib/accounts/session';

export const metadata: Metadata = { title: 'Accounts' };

export default async function AccountsPage() {
  await requireArea('admin');
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-2">
        <h1 className="text-4xl font-extrabold tracking-tight">Accounts</h1>
        <p className="max-w-2xl text-loam-soft">
          Give or take roles, and switch an account off. A change applies at the account’s next request: a removed role is refused at
          once, and switching an account off ends all its sessions.
        </p>
      </div>
      <AccountAdmin initial={{ accounts: await findAccounts('') }} />
    </div>
  );
}
