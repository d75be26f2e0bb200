// The market's wording of its failures: unknown ids and the payment provider's refusals. The
// failures themselves are HttpErrors (lib/http/errors.ts) with the codes of lib/http/types.ts.
import { HttpError } from '../http/errors';

export type MarketThing = 'listing' | 'purchase' | 'groom' | 'version' | 'licence' | 'review';

/** Not there, or not the caller's to see: the answer is the same, so others' ids are not confirmed. */
export function notFound(thing: MarketThing): HttpError {
  return new HttpError(404, 'not-found', `There is no such ${thing}.`);
}

/** A request the payment provider refused or could not answer. */
export function providerFailed(what: string, error: unknown): HttpError {
  // The provider's own text (request ids, account details, its wording) is for the server's log only.
  console.error(`[whorlwind] the payment provider could not ${what}:`, error);
  return new HttpError(502, 'payment-provider', `The payment provider could not ${what}. Try again in a moment.`);
}
