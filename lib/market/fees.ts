// The market's fee on each sale, kept apart so that checkout (which quotes it) and the recording of
// purchases (which falls back to it) share one rule without depending on each other.
import { env } from '../platform/env';

/** The market's fee on a price, in cents (rounded half up). */
export function platformFeeCents(amountCents: number, percent = env().MARKET_PLATFORM_FEE_PERCENT): number {
  return Math.min(amountCents, Math.max(0, Math.round((amountCents * percent) / 100)));
}

/** The market's fee in per cent, as the listing form shows it to sellers (MARKET_PLATFORM_FEE_PERCENT). */
export function marketFeePercent(): number {
  return env().MARKET_PLATFORM_FEE_PERCENT;
}
