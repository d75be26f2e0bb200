// The market's wording of its failures: unknown ids and the payment provider's refusals. The
// failures themselves are HttpErrors (lib/http/errors.ts) with the codes of lib/http/types.ts.
import { HttpError } from '../http/errors';

export type MarketThing = 'listing' | 'purchase' | 'groom' | 'version' | 'licence' | 'review' | 'listing version' | 'fit' | 'trial' | 'surface';

/** Not there, or not the caller's to see: the answer is the same, so others' ids are not confirmed. */
export function notFound(thing: MarketThing): HttpError {
  return new HttpError(404, 'not-found', `There is no such ${thing}.`);
}

/** Plain words for the provider's refusals people can act on; anything else is said generally. */
const PROVIDER_REASONS: Record<string, string> = {
  balance_insufficient: 'the market’s account does not hold enough money for it yet',
  charge_already_refunded: 'the payment was already refunded',
  amount_too_small: 'the amount is below the provider’s minimum',
};

/**
 * A request the payment provider refused or could not answer. People get plain words (the
 * provider's own text can be technical or name internals); the server log keeps the provider's.
 */
export function providerFailed(what: string, error: unknown): HttpError {
  const { message, code, type } = (error ?? {}) as { message?: string; code?: string; type?: string };
  console.error(`[market] the payment provider could not ${what}: ${code ? `${code}: ` : ''}${message ?? String(error)}`);
  const known = code ? PROVIDER_REASONS[code] : undefined;
  const reason = known ?? (type === 'StripeConnectionError' ? 'it could not be reached' : type === 'StripeRateLimitError' ? 'it is busy' : 'it refused the request');
  return new HttpError(502, 'payment-provider', `The payment provider could not ${what}: ${reason}.${known ? '' : ' Try again in a few minutes.'}`, {
    ...(code && { details: { providerCode: code } }),
  });
}
