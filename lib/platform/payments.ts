// The payment provider through the `stripe` SDK. With STRIPE_API_URL set (locally: the fake
// in services/payments-fake/) the SDK is pointed at that host; empty means the real API.
import Stripe from 'stripe';
import { env } from './env';

let stripe: Stripe | undefined;

export function payments(): Stripe {
  if (!stripe) {
    const config = env();
    const endpoint = config.STRIPE_API_URL ? new URL(config.STRIPE_API_URL) : null;
    stripe = new Stripe(config.STRIPE_SECRET_KEY, {
      telemetry: false,
      maxNetworkRetries: endpoint ? 0 : 2,
      ...(endpoint && {
        host: endpoint.hostname,
        port: Number(endpoint.port || (endpoint.protocol === 'https:' ? 443 : 80)),
        protocol: endpoint.protocol === 'https:' ? 'https' : 'http',
      }),
    });
  }
  return stripe;
}
