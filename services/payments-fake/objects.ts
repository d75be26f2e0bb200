// The provider's objects as the fake keeps and answers them, and how their ids, timestamps
// and amounts are written (the shapes the `stripe` SDK's types describe).
import { randomBytes } from 'node:crypto';

/** Seconds since the epoch, as every `created` of the provider. */
export const now = () => Math.floor(Date.now() / 1000);
const ALPHANUMERIC = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
/** An id like the provider's: prefix, then 24 letters and digits. */
export const newId = (prefix: string) => `${prefix}_test_${[...randomBytes(24)].map((byte) => ALPHANUMERIC[byte % 62]).join('')}`;

/** "12.34 EUR" from cents, as the page and the balance message show money. */
export function formatMoney(cents: number, currency: string) {
  return `${(cents / 100).toFixed(2)} ${currency.toUpperCase()}`;
}

/** A Checkout Session; the last two fields are the fake's own, never answered (`sessionJson`). */
export type Session = {
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

export type Charge = {
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

export type PaymentIntent = {
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

export type Refund = {
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

export type Account = { id: string; object: 'account'; type: string; email: string | null; metadata: Record<string, string>; created: number; charges_enabled: true; payouts_enabled: true };

export type Transfer = {
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

export type FakeEvent = {
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

