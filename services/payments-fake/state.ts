// Everything one running fake knows, in one object handed to every handler: its settings and
// the objects it has made. With a data folder, the objects are kept in one JSON file there,
// written before each answer that changed them (to a temporary file, then renamed over the
// old one, so a crash leaves the old file or the new one, never half of one) and read at the
// start: a restart remembers sessions, charges, refunds, accounts, transfers and the balance.
// Deliveries still waiting are not resumed after a restart (the market's reconciliation
// recovers what they carried).
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
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
  /** A folder to keep the objects in across restarts (state.json); none: memory only. */
  dataDir?: string;
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
  /** Where the objects are kept (a file in the data folder), or null. */
  statePath: string | null;
  /** Webhook deliveries waiting for their turn; cleared when the fake closes. */
  pendingTimers: Set<NodeJS.Timeout>;
};

/** An empty fake with the options' settings (deliveries after 0, 1, 3 and 8 s unless told). */
export function createState({ port, secretKey, webhookUrl = '', webhookSecret = '', retryDelaysMs = [0, 1000, 3000, 8000], dataDir }: PaymentsFakeOptions): PaymentsFakeState {
  const state: PaymentsFakeState = {
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
    statePath: dataDir ? join(dataDir, STATE_FILE) : null,
    pendingTimers: new Set(),
  };
  if (dataDir) {
    mkdirSync(dataDir, { recursive: true });
    loadObjects(state);
  }
  return state;
}

const STATE_FILE = 'state.json';
/** The kinds of objects kept, each a Map in the state. */
const KEPT = ['sessions', 'intents', 'charges', 'refunds', 'accounts', 'transfers', 'events', 'idempotent'] as const;
/** Bumped when the file's shape changes; a file of another version is refused rather than misread. */
const FILE_VERSION = 1;

function loadObjects(state: PaymentsFakeState) {
  let text: string;
  try {
    text = readFileSync(state.statePath!, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return; // a first start
    throw error;
  }
  const saved = JSON.parse(text) as { version: number } & Record<(typeof KEPT)[number], [string, unknown][]>;
  if (saved.version !== FILE_VERSION) throw new Error(`${state.statePath} is of version ${saved.version}, not ${FILE_VERSION}: move it away to start empty`);
  for (const kind of KEPT) {
    const map = state[kind] as Map<string, unknown>;
    for (const [key, value] of saved[kind] ?? []) map.set(key, value);
  }
}

/** Writes the objects to the data folder (if any), atomically: a temporary file renamed over the old one. */
export function saveObjects(state: PaymentsFakeState) {
  if (!state.statePath) return;
  const saved: Record<string, unknown> = { version: FILE_VERSION };
  for (const kind of KEPT) saved[kind] = [...(state[kind] as Map<string, unknown>).entries()];
  const temporary = `${state.statePath}.${process.pid}.tmp`;
  writeFileSync(temporary, JSON.stringify(saved));
  renameSync(temporary, state.statePath);
}
