// Events: every change the fake makes is recorded as an event and, when an endpoint is set,
// delivered to it as a webhook signed the way the SDK's `webhooks.constructEvent` checks,
// tried again after the configured delays until it gets a 2xx.
import { createHmac } from 'node:crypto';
import { newId, now, type FakeEvent } from './objects';
import type { PaymentsFakeState } from './state';

/** The `Stripe-Signature` header for a payload: t=…,v1=HMAC-SHA256(secret, "t.payload"). */
export function signPayload(payload: string, secret: string, timestamp = now()): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

/** Records an event about a copy of `object` as it is now and starts delivering it. */
export function emit(state: PaymentsFakeState, type: string, object: unknown) {
  const event: FakeEvent = {
    id: newId('evt'),
    object: 'event',
    api_version: '2026-10-28.endive',
    created: now(),
    type,
    data: { object: structuredClone(object) },
    livemode: false,
    pending_webhooks: state.webhookUrl ? 1 : 0,
    request: { id: null, idempotency_key: null },
  };
  state.events.set(event.id, event);
  if (state.webhookUrl) deliver(state, event, 0);
}

function deliver(state: PaymentsFakeState, event: FakeEvent, attempt: number) {
  const timer = setTimeout(async () => {
    state.pendingTimers.delete(timer);
    const payload = JSON.stringify(event, null, 2);
    let delivered = false;
    try {
      const response = await fetch(state.webhookUrl, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'stripe-signature': signPayload(payload, state.webhookSecret) },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      delivered = response.ok;
      await response.arrayBuffer().catch(() => undefined);
    } catch {
      delivered = false;
    }
    if (delivered) event.pending_webhooks = 0;
    else if (attempt + 1 < state.retryDelaysMs.length) deliver(state, event, attempt + 1);
  }, state.retryDelaysMs[attempt] ?? 0);
  state.pendingTimers.add(timer);
}
