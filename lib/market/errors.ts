// Failures of the market's operations that a person can act on, with the market's error codes.
// Route handlers turn them into the platform's JSON envelope (lib/market/http.ts).
import type { FieldErrors } from '../http/field-errors';

export type MarketErrorCode =
  | 'invalid-input'
  | 'not-signed-in'
  | 'forbidden'
  | 'not-found'
  | 'bad-signature'
  | 'own-listing'
  | 'already-owned'
  | 'not-for-sale'
  | 'wrong-state'
  | 'assets-pending'
  | 'package-pending'
  | 'refunded'
  | 'refund-pending'
  | 'not-owned'
  | 'nothing-to-pay-out'
  | 'choose-currency'
  | 'mail-failed'
  | 'payment-provider';

export class MarketError extends Error {
  constructor(
    readonly status: number,
    readonly code: MarketErrorCode,
    message: string,
    readonly extra: { fields?: FieldErrors; details?: Record<string, unknown> } = {},
  ) {
    super(message);
    this.name = 'MarketError';
  }
}

export type MarketThing = 'listing' | 'purchase' | 'groom' | 'version' | 'licence' | 'review';

/** Not there, or not the caller's to see: the answer is the same, so others' ids are not confirmed. */
export function notFound(thing: MarketThing): MarketError {
  return new MarketError(404, 'not-found', `There is no such ${thing}.`);
}

/** A request the payment provider refused or could not answer. */
export function providerFailed(what: string, error: unknown): MarketError {
  const message = (error as { message?: string })?.message ?? String(error);
  return new MarketError(502, 'payment-provider', `The payment provider could not ${what}: ${message}`);
}
