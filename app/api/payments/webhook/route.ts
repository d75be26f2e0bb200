// POST: the payment provider's signed events. The signature is checked on the raw body before
// anything else; 400 bad-signature changes nothing. A verified event is handled once (a repeat
// answers 200 with outcome "duplicate"), so the provider may deliver as often as it likes.
import { handler, jsonData, readLimitedText, WEBHOOK_BODY_LIMIT } from '@/lib/http/server';
import type { WebhookResponse } from '@/lib/market/types';
import { receivePaymentWebhook } from '@/lib/market/payments/webhooks';

export function POST(request: Request) {
  return handler('none', async () => {
    const raw = await readLimitedText(request, WEBHOOK_BODY_LIMIT);
    const result = await receivePaymentWebhook(raw, request.headers.get('stripe-signature'));
    return jsonData<WebhookResponse>({ received: true, ...result });
  });
}
