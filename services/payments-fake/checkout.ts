// Checkout Sessions: made by the SDK, paid on the hosted page (which makes the payment intent
// and its charge), expired by the SDK or by time. Sessions are answered without the fake's own
// bookkeeping fields.
import { invalid } from './errors';
import { integer, metadataOf, text, type FormObject } from './form';
import { newId, now, type Charge, type PaymentIntent, type Session } from './objects';
import type { PaymentsFakeState } from './state';
import { createdFilter, listOf } from './lists';
import { emit } from './webhooks';

/** The session as the API answers it. */
export function sessionJson(session: Session) {
  const { line_items_summary: _items, payment_intent_metadata: _pim, ...visible } = session;
  return visible;
}

/** An open session past its `expires_at` becomes expired (checked whenever one is read). */
export function expireIfDue(session: Session) {
  if (session.status === 'open' && session.expires_at <= now()) session.status = 'expired';
}

/** A new open session from `checkout.sessions.create` parameters (price_data line items, one currency). */
export function createSession(state: PaymentsFakeState, form: FormObject): Session {
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
    url: `${state.baseUrl}/pay/${id}`,
    created,
    expires_at: expiresAt,
    livemode: false,
    line_items_summary: summary,
    payment_intent_metadata: metadataOf((form.payment_intent_data as FormObject | undefined)?.metadata),
  };
  state.sessions.set(id, session);
  return session;
}

/** `checkout.sessions.list`, filtered by status, payment intent and `created`. */
export function listSessions(state: PaymentsFakeState, query: URLSearchParams) {
  const status = query.get('status');
  const intent = query.get('payment_intent');
  const created = createdFilter(query);
  const all = [...state.sessions.values()].filter((s) => {
    expireIfDue(s);
    return (!status || s.status === status) && (!intent || s.payment_intent === intent) && created(s.created);
  });
  const list = listOf(all, query, '/v1/checkout/sessions');
  return { ...list, data: list.data.map(sessionJson) };
}

/** `checkout.sessions.expire`: only an open session can be expired. */
export function expireSession(state: PaymentsFakeState, session: Session) {
  if (session.status !== 'open') throw invalid(`Only Checkout Sessions with a status of open can be expired; this one is ${session.status}.`, 'session');
  session.status = 'expired';
  session.url = null;
  emit(state, 'checkout.session.expired', sessionJson(session));
  return sessionJson(session);
}

/** A paid session: its succeeded payment intent and charge, then the two events about them. */
export function pay(state: PaymentsFakeState, session: Session) {
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
  state.intents.set(intent.id, intent);
  state.charges.set(charge.id, charge);
  session.status = 'complete';
  session.payment_status = 'paid';
  session.payment_intent = intent.id;
  session.url = null;
  session.customer_details = { email: session.customer_email };
  emit(state, 'payment_intent.succeeded', intent);
  emit(state, 'checkout.session.completed', sessionJson(session));
}
