// The payment provider's webhook: the signature is checked (the `stripe-signature` header, an
// HMAC of the timestamp and the raw body with the endpoint's secret, within 5 minutes of now)
// before anything is read; a bad, missing or stale signature changes nothing.
import type Stripe from 'stripe';
import { env } from '../../platform/env';
import { payments } from '../../platform/payments';
import { HttpError } from '../../http/errors';
import { handlePaymentEvent, type EventOutcome } from './purchases';

/** Seconds a signature's timestamp may lie in the past (the SDK's own default). */
export const SIGNATURE_TOLERANCE_SECONDS = 300;

export function verifyPaymentEvent(rawBody: string, signature: string | null): Stripe.Event {
  if (!signature) throw new HttpError(400, 'bad-signature', 'The request carries no stripe-signature header.');
  try {
    return payments().webhooks.constructEvent(rawBody, signature, env().STRIPE_WEBHOOK_SECRET, SIGNATURE_TOLERANCE_SECONDS);
  } catch (error) {
    throw new HttpError(400, 'bad-signature', `The signature does not check out: ${(error as Error).message}`);
  }
}

export async function receivePaymentWebhook(rawBody: string, signature: string | null): Promise<{ id: string; type: string; outcome: EventOutcome }> {
  const event = verifyPaymentEvent(rawBody, signature);
  const outcome = await handlePaymentEvent(event);
  return { id: event.id, type: event.type, outcome };
}
