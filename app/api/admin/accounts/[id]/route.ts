// An admin changes an account's roles or switches it off (or on again); it applies at the account's next request.
import { accountChangeSchema, changeAccount } from '@/lib/accounts/admin-accounts';
import type { AdminAccount } from '@/lib/accounts/types';
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';

export function PATCH(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', new HttpError(404, 'not-found', 'There is no such account.'));
    const change = await readBody(request, accountChangeSchema);
    return jsonData<AdminAccount>(await changeAccount(actor, id, change));
  });
}
