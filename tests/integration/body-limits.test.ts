// Request bodies have a size limit (1 MB for JSON and for the payment provider's events): past it
// the answer is 413 too-large with a clear message, and the read stops there — a declared
// Content-Length is not trusted, the bytes are counted.
import { callRoute, expectJson, signedInAccount } from './studio-helpers';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/lib/platform/db';
import { JSON_BODY_LIMIT, WEBHOOK_BODY_LIMIT } from '@/lib/http/server';
import * as webhookRoute from '@/app/api/payments/webhook/route';
import * as groomsRoute from '@/app/api/studio/grooms/route';

afterAll(closeDb);

const TOO_LARGE = { code: 'too-large', message: 'The request body is larger than 1 MB, the most this address accepts.' };

/** A body that never ends by itself, counting the bytes pulled from it. */
function endlessBody(chunkBytes = 64 * 1024) {
  const pulled = { bytes: 0 };
  const chunk = new Uint8Array(chunkBytes).fill(0x20);
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      pulled.bytes += chunk.byteLength;
      controller.enqueue(chunk);
    },
  });
  return { stream, pulled };
}

function webhookRequest(body: BodyInit, headers: Record<string, string> = {}) {
  return new Request('http://127.0.0.1/api/payments/webhook', {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'stripe-signature': 't=1,v1=00', ...headers },
    body,
    duplex: 'half',
  } as RequestInit);
}

describe('the payment webhook', () => {
  it('still reads an event under the limit (and checks its signature)', async () => {
    const { error } = await expectJson(await webhookRoute.POST(webhookRequest(JSON.stringify({ id: 'evt_small' }))), 400);
    expect(error.code).toBe('bad-signature');
  });

  it('refuses a body over 1 MB with 413 before checking anything', async () => {
    const body = ' '.repeat(WEBHOOK_BODY_LIMIT + 1);
    expect((await expectJson(await webhookRoute.POST(webhookRequest(body)), 413)).error).toEqual(TOO_LARGE);
  });

  it('stops reading an endless body soon after the limit', async () => {
    const { stream, pulled } = endlessBody();
    expect((await expectJson(await webhookRoute.POST(webhookRequest(stream)), 413)).error).toEqual(TOO_LARGE);
    // The stream may have one chunk queued ahead (its high-water mark) beyond the one that crossed.
    expect(pulled.bytes).toBeLessThanOrEqual(WEBHOOK_BODY_LIMIT + 3 * 64 * 1024);
  });

  it('counts the bytes when Content-Length lies', async () => {
    const { stream } = endlessBody();
    expect((await expectJson(await webhookRoute.POST(webhookRequest(stream, { 'content-length': '100' })), 413)).error).toEqual(TOO_LARGE);
  });

  it('refuses a declared Content-Length over the limit without reading', async () => {
    const { stream, pulled } = endlessBody();
    expect((await expectJson(await webhookRoute.POST(webhookRequest(stream, { 'content-length': String(WEBHOOK_BODY_LIMIT + 1) })), 413)).error).toEqual(TOO_LARGE);
    expect(pulled.bytes).toBeLessThanOrEqual(2 * 64 * 1024);
  });
});

describe('JSON bodies of the app’s routes', () => {
  it('refuses a body over 1 MB with 413, and takes one just under', async () => {
    const groomer = await signedInAccount('groomer', 'body-limit');
    const padding = (size: number) => ({ surfaceId: '00000000-0000-4000-8000-000000000000', name: 'x', pad: ' '.repeat(size) });
    const over = JSON.stringify(padding(JSON_BODY_LIMIT));
    expect((await expectJson(await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: over }), 413)).error).toEqual(TOO_LARGE);
    // Under the limit the body is read and validated as before (the unknown field is the complaint).
    const under = JSON.stringify(padding(JSON_BODY_LIMIT - 200));
    expect((await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: under })).status).not.toBe(413);
  });
});
