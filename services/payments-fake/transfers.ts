// The platform's money: connected accounts of sellers, transfers to them, and the balance they
// are paid from (charges − refunds − transfers, per currency); a transfer beyond the balance is
// refused with `balance_insufficient`.
import { FakeError, invalid, missing } from './errors';
import { integer, metadataOf, text, type FormObject } from './form';
import { formatMoney, newId, now, type Account, type Transfer } from './objects';
import type { PaymentsFakeState } from './state';
import { emit } from './webhooks';

/** Money held by the platform, per currency: charges − refunds − transfers. */
function balance(state: PaymentsFakeState): Map<string, number> {
  const totals = new Map<string, number>();
  const add = (currency: string, amount: number) => totals.set(currency, (totals.get(currency) ?? 0) + amount);
  for (const charge of state.charges.values()) add(charge.currency, charge.amount - charge.amount_refunded);
  for (const transfer of state.transfers.values()) add(transfer.currency, -transfer.amount);
  return totals;
}

/** `balance.retrieve`: everything available at once (nothing pending); 0 EUR when empty. */
export function balanceJson(state: PaymentsFakeState) {
  const amounts = [...balance(state)].map(([currency, amount]) => ({ amount, currency, source_types: { card: amount } }));
  const available = amounts.length > 0 ? amounts : [{ amount: 0, currency: 'eur', source_types: { card: 0 } }];
  return { object: 'balance', livemode: false, available, pending: available.map((a) => ({ ...a, amount: 0 })) };
}

/** `accounts.create`: a connected account, enabled at once (express unless told). */
export function createAccount(state: PaymentsFakeState, form: FormObject): Account {
  const account: Account = {
    id: newId('acct'),
    object: 'account',
    type: text(form.type) ?? 'express',
    email: text(form.email) ?? null,
    metadata: metadataOf(form.metadata),
    created: now(),
    charges_enabled: true,
    payouts_enabled: true,
  };
  state.accounts.set(account.id, account);
  return account;
}

/** `transfers.create` to a known account, within the balance of its currency. */
export function createTransfer(state: PaymentsFakeState, form: FormObject): Transfer {
  const amount = integer(form.amount, 'amount', { required: true, min: 1 })!;
  const currency = text(form.currency)?.toLowerCase();
  if (!currency) throw invalid('Missing required param: currency.', 'currency', 'parameter_missing');
  const destination = text(form.destination);
  if (!destination) throw invalid('Missing required param: destination.', 'destination', 'parameter_missing');
  if (!state.accounts.has(destination)) throw missing('account', destination, 'destination');
  const available = balance(state).get(currency) ?? 0;
  if (amount > available) {
    throw new FakeError(400, {
      error: {
        type: 'invalid_request_error',
        code: 'balance_insufficient',
        message: `You have insufficient available funds in your account (${formatMoney(available, currency)}) for this transfer.`,
      },
    });
  }
  const transfer: Transfer = {
    id: newId('tr'),
    object: 'transfer',
    amount,
    currency,
    destination,
    transfer_group: text(form.transfer_group) ?? null,
    metadata: metadataOf(form.metadata),
    created: now(),
    livemode: false,
    reversed: false,
  };
  state.transfers.set(transfer.id, transfer);
  emit(state, 'transfer.created', transfer);
  return transfer;
}
