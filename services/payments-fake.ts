// Local stand-in for the payment provider's API, answered in the shapes the `stripe` SDK
// expects. lib/payments.ts points the SDK at it with the host/port/protocol options.
// For now it knows the account balance (a health check through the SDK); checkout, webhooks,
// refunds and payouts come with the market.
import { serveJson } from './json-http';

export type PaymentsFakeOptions = { port: number; secretKey: string };

type StripeErrorBody = { error: { type: string; code: string; message: string } };

function stripeError(type: string, code: string, message: string): StripeErrorBody {
  return { error: { type, code, message } };
}

export function startPaymentsFake({ port, secretKey }: PaymentsFakeOptions) {
  return serveJson(port, (request, url, reply) => {
    if (url.pathname === '/health') return reply(200, { ok: true });

    if (request.headers.authorization !== `Bearer ${secretKey}`) {
      return reply(401, stripeError('invalid_request_error', 'api_key_invalid', 'Invalid API key provided.'));
    }
    if (request.method === 'GET' && url.pathname === '/v1/balance') {
      return reply(200, {
        object: 'balance',
        livemode: false,
        available: [{ amount: 0, currency: 'eur', source_types: { card: 0 } }],
        pending: [{ amount: 0, currency: 'eur', source_types: { card: 0 } }],
      });
    }
    return reply(
      404,
      stripeError('invalid_request_error', 'resource_missing', `Unrecognized request URL (${request.method}: ${url.pathname}).`),
    );
  });
}
