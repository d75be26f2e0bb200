// The API's routes (/v1/…, behind the secret key): which handler answers which method and
// path, and the provider's 404 for anything it does not know.
import { balanceJson, createAccount, createTransfer } from './transfers';
import { createSession, expireIfDue, expireSession, listSessions, sessionJson } from './checkout';
import { FakeError, missing } from './errors';
import type { FormObject } from './form';
import { createdFilter, listOf } from './lists';
import { createRefund } from './refunds';
import type { PaymentsFakeState } from './state';

/** An API answer: status and JSON body. */
export type ApiAnswer = { status: number; body: unknown };

/** Answers one API request; the provider's errors are thrown as FakeError. */
export function answerApi(state: PaymentsFakeState, method: string, path: string, query: URLSearchParams, form: FormObject): ApiAnswer {
  const segments = path.split('/').filter(Boolean); // ['v1', …]
  const [, resource, id, action] = segments;
  const one = <T>(map: Map<string, T>, kind: string, key: string): T => {
    const found = map.get(key);
    if (!found) throw missing(kind, key);
    return found;
  };

  if (method === 'GET' && path === '/v1/balance') return { status: 200, body: balanceJson(state) };
  if (resource === 'checkout' && id === 'sessions') {
    const sessionId = action;
    const verb = segments[4];
    if (method === 'POST' && !sessionId) return { status: 200, body: sessionJson(createSession(state, form)) };
    if (method === 'GET' && !sessionId) return { status: 200, body: listSessions(state, query) };
    const session = one(state.sessions, 'checkout.session', sessionId);
    expireIfDue(session);
    if (method === 'GET' && !verb) return { status: 200, body: sessionJson(session) };
    if (method === 'POST' && verb === 'expire') return { status: 200, body: expireSession(state, session) };
  }
  if (resource === 'payment_intents' && method === 'GET' && id) return { status: 200, body: one(state.intents, 'payment_intent', id) };
  if (resource === 'charges' && method === 'GET' && id) return { status: 200, body: one(state.charges, 'charge', id) };
  if (resource === 'refunds') {
    if (method === 'POST' && !id) return { status: 200, body: createRefund(state, form) };
    if (method === 'GET' && id) return { status: 200, body: one(state.refunds, 'refund', id) };
    if (method === 'GET') {
      const intent = query.get('payment_intent');
      const created = createdFilter(query);
      const all = [...state.refunds.values()].filter((r) => (!intent || r.payment_intent === intent) && created(r.created));
      return { status: 200, body: listOf(all, query, '/v1/refunds') };
    }
  }
  if (resource === 'accounts') {
    if (method === 'POST' && !id) return { status: 200, body: createAccount(state, form) };
    if (method === 'GET' && id) return { status: 200, body: one(state.accounts, 'account', id) };
  }
  if (resource === 'transfers') {
    if (method === 'POST' && !id) return { status: 200, body: createTransfer(state, form) };
    if (method === 'GET' && id) return { status: 200, body: one(state.transfers, 'transfer', id) };
    if (method === 'GET') {
      const destination = query.get('destination');
      const all = [...state.transfers.values()].filter((t) => !destination || t.destination === destination);
      return { status: 200, body: listOf(all, query, '/v1/transfers') };
    }
  }
  if (resource === 'events') {
    if (method === 'GET' && id) return { status: 200, body: one(state.events, 'event', id) };
    if (method === 'GET') {
      const type = query.get('type');
      const created = createdFilter(query);
      const all = [...state.events.values()].filter((e) => (!type || e.type === type) && created(e.created));
      return { status: 200, body: listOf(all, query, '/v1/events') };
    }
  }
  throw new FakeError(404, {
    error: { type: 'invalid_request_error', code: 'resource_missing', message: `Unrecognized request URL (${method}: ${path}).` },
  });
}
