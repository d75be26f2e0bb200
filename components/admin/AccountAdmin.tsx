'use client';
// The admin's accounts: find one by address, give or take its roles, switch it off or on again.
import { useState, type FormEvent } from 'react';
import useSWR from 'swr';
import { Button } from '@/components/ui/Button';
import { Notice } from '@/components/ui/Notice';
import { fetchData, request, type ApiRequestError } from '@/lib/http/client';
import { ROLE_LABELS, ROLES, type Role } from '@/lib/accounts/roles';
import type { AdminAccount } from '@/lib/accounts/types';

type AccountsResponse = { accounts: AdminAccount[] };

export function AccountAdmin({ initial }: { initial: AccountsResponse }) {
  const [search, setSearch] = useState('');
  const key = `/api/admin/accounts?search=${encodeURIComponent(search)}`;
  const { data, error, mutate } = useSWR<AccountsResponse, ApiRequestError>(key, fetchData, { fallbackData: search ? undefined : initial });
  const accounts = data?.accounts ?? [];

  function find(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setSearch(String(new FormData(event.currentTarget).get('search') ?? '').trim());
  }

  return (
    <div className="flex flex-col gap-4">
      <form role="search" aria-label="Accounts by e-mail" onSubmit={find} className="flex items-end gap-2">
        <div className="flex flex-col gap-1.5">
          <label htmlFor="account-search" className="text-sm font-semibold">
            E-mail contains
          </label>
          <input id="account-search" name="search" defaultValue={search} className="rounded-xl border-2 border-vellum bg-white px-3 py-2" />
        </div>
        <Button type="submit" look="quiet">
          Find
        </Button>
      </form>
      {error && <Notice tone="error">{error.message}</Notice>}
      {accounts.length === 0 ? (
        <p className="text-loam-soft">No accounts{search ? ` with “${search}” in the address` : ''}.</p>
      ) : (
        <ul className="flex flex-col gap-3">
          {accounts.map((account) => (
            <AccountRow key={account.id} account={account} onChanged={() => mutate()} />
          ))}
        </ul>
      )}
    </div>
  );
}

function AccountRow({ account, onChanged }: { account: AdminAccount; onChanged: () => void }) {
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function change(body: { roles?: Role[]; disabled?: boolean }) {
    setBusy(true);
    const outcome = await request<AdminAccount>('PATCH', `/api/admin/accounts/${account.id}`, body);
    setBusy(false);
    setProblem(outcome.ok ? null : outcome.error.message);
    if (outcome.ok) onChanged();
  }

  function saveRoles(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const chosen = new FormData(event.currentTarget).getAll('role').map(String);
    void change({ roles: ROLES.filter((role) => chosen.includes(role)) });
  }

  function toggleDisabled() {
    const question = account.disabled
      ? `Switch ${account.email} on again? They sign in anew; old sessions stay ended.`
      : `Switch ${account.email} off? They are signed out everywhere and cannot sign in until switched on again.`;
    if (window.confirm(question)) void change({ disabled: !account.disabled });
  }

  return (
    <li data-testid="admin-account" className="flex flex-wrap items-center justify-between gap-4 rounded-3xl bg-white px-5 py-3 ring-2 ring-vellum">
      <div className="flex flex-col">
        <span className="font-semibold">
          {account.displayName} {account.disabled && <span className="text-sm font-bold text-bracken">· switched off</span>}
        </span>
        <span className="text-sm text-loam-soft">{account.email}</span>
        {problem && <span role="alert" className="text-sm font-semibold text-bracken">{problem}</span>}
      </div>
      <form onSubmit={saveRoles} className="flex flex-wrap items-center gap-3" aria-label={`Roles of ${account.email}`}>
        {ROLES.map((role) => (
          <label key={role} className="flex items-center gap-1.5 text-sm">
            <input type="checkbox" name="role" value={role} defaultChecked={account.roles.includes(role)} />
            {ROLE_LABELS[role]}
          </label>
        ))}
        <Button type="submit" look="quiet" disabled={busy}>
          Save roles
        </Button>
        <Button type="button" look="quiet" disabled={busy} onClick={toggleDisabled}>
          {account.disabled ? 'Switch on' : 'Switch off'}
        </Button>
      </form>
    </li>
  );
}
