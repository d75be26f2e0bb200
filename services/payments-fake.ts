// Local stand-in for the payment provider's API, answered in the shapes the `stripe` SDK
// expects (lib/platform/payments.ts points the SDK at it with the host/port/protocol options).
//
// What it knows: Checkout Sessions (create, retrieve, list, expire) with its own hosted payment
// page and test cards; payment intents and charges behind them; refunds; connected accounts and
// transfers to them; the balance; events, each delivered as a signed webhook to one endpoint
// (signed the way the SDK's `webhooks.constructEvent` checks), retried a few times when the
// endpoint does not answer 2xx. Everything lives in memory: a restart forgets it.
//
// Test cards on the hosted page:
//   4242 4242 4242 4242  succeeds
//   4000 0000 0000 0002  declined (card_declined)
//   4000 0000 0000 9995  declined (insufficient_funds)
import { createHmac, randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { escapeHtml } from '../lib/platform/html';

export type PaymentsFakeOptions = {
  port: number;
  secretKey: string;
  /** Where events are delivered (the app's webhook route); empty: events are only listed. */
  webhookUrl?: string;
  /** Signs the deliveries (whsec_…). */
  webhookSecret?: string;
  /** Delays between delivery attempts of one event, in ms (first attempt at once). */
  retryDelaysMs?: number[];
};

type StripeErrorBody = { error: { type: string; code?: string; decline_code?: string; message: string; param?: string } };

class FakeError extends Error {
  constructor(
    readonly status: number,
    readonly body: StripeErrorBody,
  ) {
    super(body.error.message);
  }
}

function invalid(message: string, param?: string, code = 'parameter_invalid'): FakeError {
  return new FakeError(400, { error: { type: 'invalid_request_error', code, message, ...(param && { param }) } });
}

function missing(kind: string, id: string, param = 'id'): FakeError {
  return new FakeError(404, {
    error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such ${kind}: '${id}'`, param },
  });
}

const now = () => Math.floor(Date.now() / 1000);
const ALPHANUMERIC = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
/** An id like the provider's: prefix, then 24 letters and digits. */
const newId = (prefix: string) => `${prefix}_test_${[...randomBytes(24)].map((byte) => ALPHANUMERIC[byte % 62]).join('')}`;

// ---- form bodies with bracketed keys: a[b][0][c]=v -------------------------------------------

type FormValue = string | FormObject | FormValue[];
type FormObject = { [key: string]: FormValue };

/** Decodes the SDK's form encoding into nested objects; numeric keys make arrays. */
export function decodeForm(text: string): FormObject {
  const root: FormObject = {};
  for (const [rawKey, value] of new URLSearchParams(text)) {
    const parts = rawKey.replace(/\]/g, '').split('[');
    let node: FormObject | FormValue[] = root;
    parts.forEach((part, i) => {
      const last = i === parts.length - 1;
      const key = Array.isArray(node) ? Number(part) : part;
      const container = node as Record<string | number, FormValue>;
      if (last) {
        container[key] = value;
        return;
      }
      if (container[key] === undefined) container[key] = /^\d+$/.test(parts[i + 1]) ? [] : {};
      node = container[key] as FormObject | FormValue[];
    });
  }
  return root;
}

function text(value: FormValue | undefined): string | undefined {
  return typeof value === 'string' ? value : undefined;
}

function integer(value: FormValue | undefined, param: string, { min = 0, required = false } = {}): number | undefined {
  if (value === undefined) {
    if (required) throw invalid(`Missing required param: ${param}.`, param, 'parameter_missing');
    return undefined;
  }
  const n = Number(text(value));
  if (!Number.isInteger(n) || n < min) throw invalid(`Invalid integer: ${String(value)}`, param);
  return n;
}

function metadataOf(value: FormValue | undefined): Record<string, string> {
  if (!value || typeof value !== 'object' || Array.isArray(value)) return {};
  const out: Record<string, string> = {};
  for (const [key, v] of Object.entries(value)) if (typeof v === 'string') out[key] = v;
  return out;
}

// ---- the objects ---------------------------------------------------------------------------------

type Session = {
  id: string;
  object: 'checkout.session';
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  customer_details: { email: string | null } | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  line_items_summary: { name: string; quantity: number; unit_amount: number }[];
  payment_intent_metadata: Record<string, string>;
};

type Charge = {
  id: string;
  object: 'charge';
  amount: number;
  amount_refunded: number;
  currency: string;
  payment_intent: string;
  refunded: boolean;
  status: 'succeeded';
  metadata: Record<string, string>;
  created: number;
  livemode: false;
};

type PaymentIntent = {
  id: string;
  object: 'payment_intent';
  amount: number;
  currency: string;
  status: 'succeeded';
  latest_charge: string;
  metadata: Record<string, string>;
  created: number;
  livemode: false;
};

type Refund = {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  charge: string;
  payment_intent: string;
  reason: string | null;
  status: 'succeeded';
  metadata: Record<string, string>;
  created: number;
};

type Account = { id: string; object: 'account'; type: string; email: string | null; metadata: Record<string, string>; created: number; charges_enabled: true; payouts_enabled: true };

type Transfer = {
  id: string;
  object: 'transfer';
  amount: number;
  currency: string;
  destination: string;
  transfer_group: string | null;
  metadata: Record<string, string>;
  created: number;
  livemode: false;
  reversed: false;
};

type FakeEvent = {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  type: string;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: null; idempotency_key: null };
};

type Listable = { id: string; created: number };

/** Stripe's list envelope with `limit`, `starting_after`, `ending_before`; newest first. */
function listOf<T extends Listable>(all: T[], query: URLSearchParams, path: string) {
  const limit = Math.min(Math.max(Number(query.get('limit') ?? 10) || 10, 1), 100);
  let items = [...all].reverse(); // kept in creation order; lists go newest first
  const after = query.get('starting_after');
  const before = query.get('ending_before');
  if (after) {
    const at = items.findIndex((item) => item.id === after);
    if (at < 0) throw missing('object', after, 'starting_after');
    items = items.slice(at + 1);
  }
  if (before) {
    const at = items.findIndex((item) => item.id === before);
    if (at < 0) throw missing('object', before, 'ending_before');
    items = items.slice(Math.max(0, at - limit), at);
  }
  return { object: 'list', url: path, has_more: items.length > limit, data: items.slice(0, limit) };
}

/** created[gte]=…&created[lte]=… or created=… from a query string. */
function createdFilter(query: URLSearchParams): (created: number) => boolean {
  const exact = query.get('created');
  const bounds = { gt: query.get('created[gt]'), gte: query.get('created[gte]'), lt: query.get('created[lt]'), lte: query.get('created[lte]') };
  return (created) =>
    (exact === null || created === Number(exact)) &&
    (bounds.gt === null || created > Number(bounds.gt)) &&
    (bounds.gte === null || created >= Number(bounds.gte)) &&
    (bounds.lt === null || created < Number(bounds.lt)) &&
    (bounds.lte === null || created <= Number(bounds.lte));
}

/** The `Stripe-Signature` header for a payload: t=…,v1=HMAC-SHA256(secret, "t.payload"). */
export function signPayload(payload: string, secret: string, timestamp = now()): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

const DECLINES: Record<string, { code: string; message: string }> = {
  '4000000000000002': { code: 'card_declined', message: 'Your card was declined.' },
  '4000000000009995': { code: 'insufficient_funds', message: 'Your card has insufficient funds.' },
};
const SUCCEEDS = new Set(['4242424242424242']);

function formatMoney(cents: number, currency: string) {
  return `${(cents / 100).toFixed(2)} ${currency.toUpperCase()}`;
}

function checkoutPage(session: Session, notice?: { kind: 'error' | 'info'; text: string }) {
  const items = session.line_items_summary
    .map((item) => `<li>${escapeHtml(item.name)} × ${item.quantity} — ${formatMoney(item.unit_amount * item.quantity, session.currency)}</li>`)
    .join('');
  const body =
    session.status === 'open'
      ? `<form method="post" action="/pay/${session.id}">
  <label>Card number <input name="card" inputmode="numeric" autocomplete="cc-number" value="" required></label>
  <label>Expiry (MM/YY) <input name="expiry" value="12/34" required></label>
  <label>CVC <input name="cvc" value="123" required></label>
  <button type="submit">Pay ${formatMoney(session.amount_total, session.currency)}</button>
</form>
${session.cancel_url ? `<p><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ''}
<p class="hint">Test cards: 4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined; 4000 0000 0000 9995 has insufficient funds.</p>`
      : `<p>This checkout is ${session.status === 'complete' ? 'already paid' : 'no longer open (it expired)'}.</p>`;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Pay — local payments stand-in</title>
<style>body{font:16px system-ui,sans-serif;max-width:28rem;margin:3rem auto;padding:0 1rem}label{display:block;margin:.6rem 0}input{display:block;width:100%;padding:.4rem}button{margin-top:1rem;padding:.6rem 1rem}.error{color:#a00}.hint{color:#555;font-size:.85rem}</style>
</head><body>
<h1>Checkout</h1>
<p>A local stand-in for the payment provider: no money moves.</p>
<ul>${items}</ul>
<p><strong>Total: ${formatMoney(session.amount_total, session.currency)}</strong></p>
${notice ? `<p class="${notice.kind}" role="alert">${escapeHtml(notice.text)}</p>` : ''}
${body}
</body></html>`;
}

function readBody(request: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    request.on('data', (chunk: Buffer) => chunks.push(chunk));
    request.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    request.on('error', reject);
  });
}

export function startPaymentsFake({ port, secretKey, webhookUrl = '', webhookSecret = '', retryDelaysMs = [0, 1000, 3000, 8000] }: PaymentsFakeOptions) {
  const sessions = new Map<string, Session>();
  const intents = new Map<string, PaymentIntent>();
  const charges = new Map<string, Charge>();
  const refunds = new Map<string, Refund>();
  const accounts = new Map<string, Account>();
  const transfers = new Map<string, Transfer>();
  const events = new Map<string, FakeEvent>();
  const idempotent = new Map<string, { status: number; body: unknown }>();
  const pendingTimers = new Set<NodeJS.Timeout>();
  const baseUrl = `http://127.0.0.1:${port}`;

  /** Money held by the platform, per currency: charges − refunds − transfers. */
  function balance(): Map<string, number> {
    const totals = new Map<string, number>();
    const add = (currency: string, amount: number) => totals.set(currency, (totals.get(currency) ?? 0) + amount);
    for (const charge of charges.values()) add(charge.currency, charge.amount - charge.amount_refunded);
    for (const transfer of transfers.values()) add(transfer.currency, -transfer.amount);
    return totals;
  }

  function emit(type: string, object: unknown) {
    const event: FakeEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: '2026-10-28.endive',
      created: now(),
      type,
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: webhookUrl ? 1 : 0,
      request: { id: null, idempotency_key: null },
    };
    events.set(event.id, event);
    if (webhookUrl) deliver(event, 0);
  }

  function deliver(event: FakeEvent, attempt: number) {
    const timer = setTimeout(async () => {
      pendingTimers.delete(timer);
      const payload = JSON.stringify(event, null, 2);
      let delivered = false;
      try {
        const response = await fetch(webhookUrl, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'stripe-signature': signPayload(payload, webhookSecret) },
          body: payload,
          signal: AbortSignal.timeout(10_000),
        });
        delivered = response.ok;
        await response.arrayBuffer().catch(() => undefined);
      } catch {
        delivered = false;
      }
      if (delivered) event.pending_webhooks = 0;
      else if (attempt + 1 < retryDelaysMs.length) deliver(event, attempt + 1);
    }, retryDelaysMs[attempt] ?? 0);
    pendingTimers.add(timer);
  }

  function sessionJson(session: Session) {
    const { line_items_summary: _items, payment_intent_metadata: _pim, ...visible } = session;
    return visible;
  }

  function expireIfDue(session: Session) {
    if (session.status === 'open' && session.expires_at <= now()) session.status = 'expired';
  }

  function createSession(form: FormObject): Session {
    if (text(form.mode) !== 'payment') throw invalid('Only mode=payment is supported by the local stand-in.', 'mode');
    const successUrl = text(form.success_url);
    if (!successUrl) throw invalid('Missing required param: success_url.', 'success_url', 'parameter_missing');
    const lineItems = Array.isArray(form.line_items) ? form.line_items : [];
    if (lineItems.length === 0) throw invalid('Missing required param: line_items.', 'line_items', 'parameter_missing');
    let currency: string | undefined;
    const summary = lineItems.map((raw, i) => {
      const item = raw as FormObject;
      const priceData = item.price_data as FormObject | undefined;
      if (!priceData) throw invalid('Each line item needs price_data in the local stand-in.', `line_items[${i}][price_data]`);
      const itemCurrency = text(priceData.currency)?.toLowerCase();
      if (!itemCurrency || !/^[a-z]{3}$/.test(itemCurrency)) throw invalid('Invalid currency.', `line_items[${i}][price_data][currency]`);
      if (currency && currency !== itemCurrency) throw invalid('All line items must share one currency.', `line_items[${i}][price_data][currency]`);
      currency = itemCurrency;
      const unitAmount = integer(priceData.unit_amount, `line_items[${i}][price_data][unit_amount]`, { required: true, min: 0 })!;
      const quantity = integer(item.quantity, `line_items[${i}][quantity]`, { required: true, min: 1 })!;
      const product = priceData.product_data as FormObject | undefined;
      return { name: text(product?.name) ?? 'Item', quantity, unit_amount: unitAmount };
    });
    const total = summary.reduce((sum, item) => sum + item.unit_amount * item.quantity, 0);
    if (total < 50) throw invalid('The amount must be at least 50 cents.', 'line_items', 'amount_too_small');
    const created = now();
    const expiresAt = integer(form.expires_at, 'expires_at') ?? created + 24 * 60 * 60;
    if (expiresAt < created + 30 * 60 || expiresAt > created + 24 * 60 * 60) {
      throw invalid('expires_at must be between 30 minutes and 24 hours from now.', 'expires_at');
    }
    const id = newId('cs');
    const session: Session = {
      id,
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_subtotal: total,
      amount_total: total,
      currency: currency!,
      client_reference_id: text(form.client_reference_id) ?? null,
      customer_email: text(form.customer_email) ?? null,
      customer_details: null,
      metadata: metadataOf(form.metadata),
      payment_intent: null,
      success_url: successUrl,
      cancel_url: text(form.cancel_url) ?? null,
      url: `${baseUrl}/pay/${id}`,
      created,
      expires_at: expiresAt,
      livemode: false,
      line_items_summary: summary,
      payment_intent_metadata: metadataOf((form.payment_intent_data as FormObject | undefined)?.metadata),
    };
    sessions.set(id, session);
    return session;
  }

  function pay(session: Session) {
    const created = now();
    const intent: PaymentIntent = {
      id: newId('pi'),
      object: 'payment_intent',
      amount: session.amount_total,
      currency: session.currency,
      status: 'succeeded',
      latest_charge: '',
      metadata: session.payment_intent_metadata,
      created,
      livemode: false,
    };
    const charge: Charge = {
      id: newId('ch'),
      object: 'charge',
      amount: session.amount_total,
      amount_refunded: 0,
      currency: session.currency,
      payment_intent: intent.id,
      refunded: false,
      status: 'succeeded',
      metadata: session.payment_intent_metadata,
      created,
      livemode: false,
    };
    intent.latest_charge = charge.id;
    intents.set(intent.id, intent);
    charges.set(charge.id, charge);
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = intent.id;
    session.url = null;
    session.customer_details = { email: session.customer_email };
    emit('payment_intent.succeeded', intent);
    emit('checkout.session.completed', sessionJson(session));
  }

  function createRefund(form: FormObject): Refund {
    const chargeId = text(form.charge);
    const intentId = text(form.payment_intent);
    let charge: Charge | undefined;
    if (chargeId) charge = charges.get(chargeId);
    else if (intentId) {
      const intent = intents.get(intentId);
      if (!intent) throw missing('payment_intent', intentId, 'payment_intent');
      charge = charges.get(intent.latest_charge);
    } else throw invalid('Give a charge or a payment_intent to refund.', 'payment_intent', 'parameter_missing');
    if (!charge) throw missing('charge', chargeId ?? '', 'charge');
    const left = charge.amount - charge.amount_refunded;
    if (left <= 0) {
      throw new FakeError(400, { error: { type: 'invalid_request_error', code: 'charge_already_refunded', message: `Charge ${charge.id} has already been refunded.` } });
    }
    const amount = integer(form.amount, 'amount', { min: 1 }) ?? left;
    if (amount > left) throw invalid(`Refund amount (${amount}) is greater than unrefunded amount on charge (${left}).`, 'amount', 'amount_too_large');
    const refund: Refund = {
      id: newId('re'),
      object: 'refund',
      amount,
      currency: charge.currency,
      charge: charge.id,
      payment_intent: charge.payment_intent,
      reason: text(form.reason) ?? null,
      status: 'succeeded',
      metadata: metadataOf(form.metadata),
      created: now(),
    };
    refunds.set(refund.id, refund);
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded >= charge.amount;
    emit('charge.refunded', charge);
    emit('refund.created', refund);
    return refund;
  }

  function createTransfer(form: FormObject): Transfer {
    const amount = integer(form.amount, 'amount', { required: true, min: 1 })!;
    const currency = text(form.currency)?.toLowerCase();
    if (!currency) throw invalid('Missing required param: currency.', 'currency', 'parameter_missing');
    const destination = text(form.destination);
    if (!destination) throw invalid('Missing required param: destination.', 'destination', 'parameter_missing');
    if (!accounts.has(destination)) throw missing('account', destination, 'destination');
    const available = balance().get(currency) ?? 0;
    if (amount > available) {
      throw new FakeError(400, {
        error: {
          type: 'invalid_request_error',
          code: 'balance_insufficient',
          message: `You have insufficient available funds in your account (${formatMoney(available, currency)}) for this transfer.`,
        },
      });
    }
    const transfer: Transfer = {
      id: newId('tr'),
      object: 'transfer',
      amount,
      currency,
      destination,
      transfer_group: text(form.transfer_group) ?? null,
      metadata: metadataOf(form.metadata),
      created: now(),
      livemode: false,
      reversed: false,
    };
    transfers.set(transfer.id, transfer);
    emit('transfer.created', transfer);
    return transfer;
  }

  type Route = { status: number; body: unknown };

  function api(method: string, path: string, query: URLSearchParams, form: FormObject): Route {
    const segments = path.split('/').filter(Boolean); // ['v1', …]
    const [, resource, id, action] = segments;
    const one = <T>(map: Map<string, T>, kind: string, key: string): T => {
      const found = map.get(key);
      if (!found) throw missing(kind, key);
      return found;
    };

    if (method === 'GET' && path === '/v1/balance') {
      const amounts = [...balance()].map(([currency, amount]) => ({ amount, currency, source_types: { card: amount } }));
      const available = amounts.length > 0 ? amounts : [{ amount: 0, currency: 'eur', source_types: { card: 0 } }];
      return { status: 200, body: { object: 'balance', livemode: false, available, pending: available.map((a) => ({ ...a, amount: 0 })) } };
    }
    if (resource === 'checkout' && id === 'sessions') {
      const sessionId = action;
      const verb = segments[4];
      if (method === 'POST' && !sessionId) return { status: 200, body: sessionJson(createSession(form)) };
      if (method === 'GET' && !sessionId) {
        const status = query.get('status');
        const intent = query.get('payment_intent');
        const created = createdFilter(query);
        const all = [...sessions.values()].filter((s) => {
          expireIfDue(s);
          return (!status || s.status === status) && (!intent || s.payment_intent === intent) && created(s.created);
        });
        const list = listOf(all, query, '/v1/checkout/sessions');
        return { status: 200, body: { ...list, data: list.data.map(sessionJson) } };
      }
      const session = one(sessions, 'checkout.session', sessionId);
      expireIfDue(session);
      if (method === 'GET' && !verb) return { status: 200, body: sessionJson(session) };
      if (method === 'POST' && verb === 'expire') {
        if (session.status !== 'open') throw invalid(`Only Checkout Sessions with a status of open can be expired; this one is ${session.status}.`, 'session');
        session.status = 'expired';
        session.url = null;
        emit('checkout.session.expired', sessionJson(session));
        return { status: 200, body: sessionJson(session) };
      }
    }
    if (resource === 'payment_intents' && method === 'GET' && id) return { status: 200, body: one(intents, 'payment_intent', id) };
    if (resource === 'charges' && method === 'GET' && id) return { status: 200, body: one(charges, 'charge', id) };
    if (resource === 'refunds') {
      if (method === 'POST' && !id) return { status: 200, body: createRefund(form) };
      if (method === 'GET' && id) return { status: 200, body: one(refunds, 'refund', id) };
      if (method === 'GET') return { status: 200, body: listOf([...refunds.values()], query, '/v1/refunds') };
    }
    if (resource === 'accounts') {
      if (method === 'POST' && !id) {
        const account: Account = {
          id: newId('acct'),
          object: 'account',
          type: text(form.type) ?? 'express',
          email: text(form.email) ?? null,
          metadata: metadataOf(form.metadata),
          created: now(),
          charges_enabled: true,
          payouts_enabled: true,
        };
        accounts.set(account.id, account);
        return { status: 200, body: account };
      }
      if (method === 'GET' && id) return { status: 200, body: one(accounts, 'account', id) };
    }
    if (resource === 'transfers') {
      if (method === 'POST' && !id) return { status: 200, body: createTransfer(form) };
      if (method === 'GET' && id) return { status: 200, body: one(transfers, 'transfer', id) };
      if (method === 'GET') {
        const destination = query.get('destination');
        const all = [...transfers.values()].filter((t) => !destination || t.destination === destination);
        return { status: 200, body: listOf(all, query, '/v1/transfers') };
      }
    }
    if (resource === 'events') {
      if (method === 'GET' && id) return { status: 200, body: one(events, 'event', id) };
      if (method === 'GET') {
        const type = query.get('type');
        const created = createdFilter(query);
        const all = [...events.values()].filter((e) => (!type || e.type === type) && created(e.created));
        return { status: 200, body: listOf(all, query, '/v1/events') };
      }
    }
    throw new FakeError(404, {
      error: { type: 'invalid_request_error', code: 'resource_missing', message: `Unrecognized request URL (${method}: ${path}).` },
    });
  }

  async function handle(request: IncomingMessage, response: ServerResponse) {
    const url = new URL(request.url ?? '/', baseUrl);
    const method = request.method ?? 'GET';
    const send = (status: number, body: unknown) => {
      response.writeHead(status, { 'content-type': 'application/json' });
      response.end(JSON.stringify(body));
    };
    const html = (status: number, page: string) => {
      response.writeHead(status, { 'content-type': 'text/html; charset=utf-8' });
      response.end(page);
    };
    const body = method === 'POST' ? await readBody(request) : '';

    if (url.pathname === '/health') return send(200, { ok: true });

    // The hosted checkout page: what the buyer's browser sees; no API key.
    const payPage = url.pathname.match(/^\/pay\/([A-Za-z0-9_]+)$/);
    if (payPage) {
      const session = sessions.get(payPage[1]);
      if (!session) return html(404, '<!doctype html><title>Not found</title><p>There is no such checkout.</p>');
      expireIfDue(session);
      if (method === 'GET') return html(200, checkoutPage(session));
      if (method !== 'POST') return html(405, '<!doctype html><p>Method not allowed.</p>');
      if (session.status !== 'open') return html(409, checkoutPage(session));
      const card = (new URLSearchParams(body).get('card') ?? '').replace(/[\s-]/g, '');
      const decline = DECLINES[card];
      if (decline) {
        emit('payment_intent.payment_failed', { id: newId('pi'), object: 'payment_intent', amount: session.amount_total, currency: session.currency, status: 'requires_payment_method', last_payment_error: { code: decline.code, message: decline.message } });
        return html(402, checkoutPage(session, { kind: 'error', text: decline.message }));
      }
      if (!SUCCEEDS.has(card)) return html(400, checkoutPage(session, { kind: 'error', text: 'Use one of the test card numbers below.' }));
      pay(session);
      const target = session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id);
      response.writeHead(303, { location: target });
      return response.end();
    }

    if (request.headers.authorization !== `Bearer ${secretKey}`) {
      return send(401, { error: { type: 'invalid_request_error', code: 'api_key_invalid', message: 'Invalid API key provided.' } });
    }
    const key = method === 'POST' ? request.headers['idempotency-key'] : undefined;
    const idempotencyKey = typeof key === 'string' ? `${url.pathname}:${key}` : undefined;
    if (idempotencyKey && idempotent.has(idempotencyKey)) {
      const saved = idempotent.get(idempotencyKey)!;
      response.setHeader('idempotent-replayed', 'true');
      return send(saved.status, saved.body);
    }
    let result: Route;
    try {
      result = api(method, url.pathname, url.searchParams, method === 'POST' ? decodeForm(body) : {});
    } catch (error) {
      if (!(error instanceof FakeError)) throw error;
      result = { status: error.status, body: error.body };
    }
    if (idempotencyKey && result.status < 500) idempotent.set(idempotencyKey, result);
    return send(result.status, result.body);
  }
  const server = createServer((request, response) => {
    handle(request, response).catch((error) => {
      if (!response.headersSent) response.writeHead(500, { 'content-type': 'application/json' });
      response.end(JSON.stringify({ error: { type: 'api_error', message: (error as Error).message } }));
    });
  });

  return new Promise<{ url: string; close: () => Promise<void> }>((resolve, reject) => {
    server.on('error', reject);
    server.listen(port, '127.0.0.1', () =>
      resolve({
        url: baseUrl,
        close: async () => {
          for (const timer of pendingTimers) clearTimeout(timer);
          pendingTimers.clear();
          server.closeAllConnections();
          await new Promise<void>((done) => server.close(() => done()));
        },
      }),
    );
  });
}
