// The admin's list of accounts, searched by e-mail address (?search=).
import { findAccounts } from '@/lib/accounts/admin-accounts';
import type { AdminAccount } from '@/lib/accounts/types';
import { handler, jsonData, queryOf } from '@/lib/http/server';

export function GET(request: Request) {
  return handler(['admin'], async () => {
    const { search } = queryOf(request);
    return jsonData<{ accounts: AdminAccount[] }>({ accounts: await findAccounts(typeof search === 'string' ? search.trim() : '') });
  });
}
