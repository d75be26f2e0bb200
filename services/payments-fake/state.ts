// Everything one running fake knows, in one object handed to every handler: its settings and
// the objects it has made. It lives in memory only: a restart forgets it.
import type { Account, Charge, FakeEvent, PaymentIntent, Refund, Session, Transfer } from './objects';

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

export type PaymentsFakeState = {
  /** http://127.0.0.1:<port>: the API's and the hosted page's origin. */
  baseUrl: string;
  secretKey: string;
  webhookUrl: string;
  webhookSecret: string;
  retryDelaysMs: number[];
  sessions: Map<string, Session>;
  intents: Map<string, PaymentIntent>;
  charges: Map<string, Charge>;
  refunds: Map<string, Refund>;
  accounts: Map<string, Account>;
  transfers: Map<string, Transfer>;
  events: Map<string, FakeEvent>;
  /** Answers already given to a POST with an `Idempotency-Key`, by "<path>:<key>". */
  idempotent: Map<string, { status: number; body: unknown }>;
  /** Webhook deliveries waiting for their turn; cleared when the fake closes. */
  pendingTimers: Set<NodeJS.Timeout>;
};

/** An empty fake with the options' settings (deliveries after 0, 1, 3 and 8 s unless told). */
export function createState({ port, secretKey, webhookUrl = '', webhookSecret = '', retryDelaysMs = [0, 1000, 3000, 8000] }: PaymentsFakeOptions): PaymentsFakeState {
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    secretKey,
    webhookUrl,
    webhookSecret,
    retryDelaysMs,
    sessions: new Map(),
    intents: new Map(),
    charges: new Map(),
    refunds: new Map(),
    accounts: new Map(),
    transfers: new Map(),
    events: new Map(),
    idempotent: new Map(),
    pendingTimers: new Set(),
  };
}
