// POST: the payment provider's signed events. The signature is checked on the raw body before
// anything else; 400 bad-signature changes nothing. A verified event is handled once (a repeat
// answers 200 with outcome "duplicate"), so the provider may deliver as often as it likes.
import { marketData, plainMarketHandler } from '@/lib/market/http';
import { receivePaymentWebhook } from '@/lib/market/webhooks';

export type WebhookResponse = { received: true; id: string; type: string; outcome: 'handled' | 'duplicate' | 'ignored' };

export function POST(request: Request) {
  return plainMarketHandler(async () => {
    const raw = await request.text();
    const result = await receivePaymentWebhook(raw, request.headers.get('stripe-signature'));
    return marketData<WebhookResponse>({ received: true, ...result });
  });
}
