// Local stand-in for the payment provider's API, answered in the shapes the `stripe` SDK
// expects (lib/platform/payments.ts points the SDK at it with the host/port/protocol options).
//
// What it knows: Checkout Sessions (create, retrieve, list, expire) with its own hosted payment
// page and test cards (checkout.ts, checkout-page.ts); payment intents and charges behind them;
// refunds (refunds.ts); connected accounts and transfers to them, and the balance
// (transfers.ts); events, each delivered as a signed webhook to one endpoint, retried a few
// times when the endpoint does not answer 2xx (webhooks.ts). Everything lives in one state
// object (state.ts), kept in a JSON file when a data folder is given, so a restart remembers it
// (each POST is written before it is answered). This file is the HTTP server: the hosted page,
// the API key, `Idempotency-Key` replays, and the router (router.ts) for the rest.
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { answerPayPage } from './checkout-page';
import { FakeError } from './errors';
import { decodeForm } from './form';
import { answerApi, type ApiAnswer } from './router';
import { createState, saveObjects, type PaymentsFakeOptions, type PaymentsFakeState } from './state';

function readBody(request: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    request.on('data', (chunk: Buffer) => chunks.push(chunk));
    request.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    request.on('error', reject);
  });
}

async function handle(state: PaymentsFakeState, request: IncomingMessage, response: ServerResponse) {
  const url = new URL(request.url ?? '/', state.baseUrl);
  const method = request.method ?? 'GET';
  const send = (status: number, body: unknown) => {
    response.writeHead(status, { 'content-type': 'application/json' });
    response.end(JSON.stringify(body));
  };
  const body = method === 'POST' ? await readBody(request) : '';

  if (url.pathname === '/health') return send(200, { ok: true });

  // The hosted checkout page: what the buyer's browser sees; no API key.
  const payPage = url.pathname.match(/^\/pay\/([A-Za-z0-9_]+)$/);
  if (payPage) {
    const answer = answerPayPage(state, method, payPage[1], body);
    if (method === 'POST') saveObjects(state);
    if ('redirect' in answer) {
      response.writeHead(303, { location: answer.redirect });
      return response.end();
    }
    response.writeHead(answer.status, { 'content-type': 'text/html; charset=utf-8' });
    return response.end(answer.page);
  }

  if (request.headers.authorization !== `Bearer ${state.secretKey}`) {
    return send(401, { error: { type: 'invalid_request_error', code: 'api_key_invalid', message: 'Invalid API key provided.' } });
  }
  const key = method === 'POST' ? request.headers['idempotency-key'] : undefined;
  const idempotencyKey = typeof key === 'string' ? `${url.pathname}:${key}` : undefined;
  if (idempotencyKey && state.idempotent.has(idempotencyKey)) {
    const saved = state.idempotent.get(idempotencyKey)!;
    response.setHeader('idempotent-replayed', 'true');
    return send(saved.status, saved.body);
  }
  let result: ApiAnswer;
  try {
    result = answerApi(state, method, url.pathname, url.searchParams, method === 'POST' ? decodeForm(body) : {});
  } catch (error) {
    if (!(error instanceof FakeError)) throw error;
    result = { status: error.status, body: error.body };
  }
  if (idempotencyKey && result.status < 500) state.idempotent.set(idempotencyKey, result);
  // What the SDK was told is on disk before it is told (a GET may expire a session: kept too, lazily, with the next POST).
  if (method === 'POST') saveObjects(state);
  return send(result.status, result.body);
}

/** Starts an empty fake on 127.0.0.1:port; resolves once it listens. `close` also drops the deliveries still waiting. */
export function startPaymentsFake(options: PaymentsFakeOptions) {
  const state = createState(options);
  const server = createServer((request, response) => {
    handle(state, request, response).catch((error) => {
      if (!response.headersSent) response.writeHead(500, { 'content-type': 'application/json' });
      response.end(JSON.stringify({ error: { type: 'api_error', message: (error as Error).message } }));
    });
  });

  return new Promise<{ url: string; close: () => Promise<void> }>((resolve, reject) => {
    server.on('error', reject);
    server.listen(options.port, '127.0.0.1', () =>
      resolve({
        url: state.baseUrl,
        close: async () => {
          for (const timer of state.pendingTimers) clearTimeout(timer);
          state.pendingTimers.clear();
          saveObjects(state);
          server.closeAllConnections();
          await new Promise<void>((done) => server.close(() => done()));
        },
      }),
    );
  });
}
