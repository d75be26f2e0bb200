// Refunds of a charge (named directly or through its payment intent), whole or in part, never
// beyond what is left of it; each refund records `charge.refunded` and `refund.created`.
import { FakeError, invalid, missing } from './errors';
import { integer, metadataOf, text, type FormObject } from './form';
import { newId, now, type Charge, type Refund } from './objects';
import type { PaymentsFakeState } from './state';
import { emit } from './webhooks';

/** `refunds.create`: the rest of the charge unless `amount` says less. */
export function createRefund(state: PaymentsFakeState, form: FormObject): Refund {
  const chargeId = text(form.charge);
  const intentId = text(form.payment_intent);
  let charge: Charge | undefined;
  if (chargeId) charge = state.charges.get(chargeId);
  else if (intentId) {
    const intent = state.intents.get(intentId);
    if (!intent) throw missing('payment_intent', intentId, 'payment_intent');
    charge = state.charges.get(intent.latest_charge);
  } else throw invalid('Give a charge or a payment_intent to refund.', 'payment_intent', 'parameter_missing');
  if (!charge) throw missing('charge', chargeId ?? '', 'charge');
  const left = charge.amount - charge.amount_refunded;
  if (left <= 0) {
    throw new FakeError(400, { error: { type: 'invalid_request_error', code: 'charge_already_refunded', message: `Charge ${charge.id} has already been refunded.` } });
  }
  const amount = integer(form.amount, 'amount', { min: 1 }) ?? left;
  if (amount > left) throw invalid(`Refund amount (${amount}) is greater than unrefunded amount on charge (${left}).`, 'amount', 'amount_too_large');
  const refund: Refund = {
    id: newId('re'),
    object: 'refund',
    amount,
    currency: charge.currency,
    charge: charge.id,
    payment_intent: charge.payment_intent,
    reason: text(form.reason) ?? null,
    status: 'succeeded',
    metadata: metadataOf(form.metadata),
    created: now(),
  };
  state.refunds.set(refund.id, refund);
  charge.amount_refunded += amount;
  charge.refunded = charge.amount_refunded >= charge.amount;
  emit(state, 'charge.refunded', charge);
  emit(state, 'refund.created', refund);
  return refund;
}
