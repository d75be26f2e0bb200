// Request bodies have a size limit (1 MB for JSON and for the payment provider's events): past it
// the answer is 413 too-large with a clear message, and the read stops there — a declared
// Content-Length is not trusted, the bytes are counted.
import { callRoute, expectJson, signedInAccount, withinRequest } from './studio-helpers';
import { NextRequest } from 'next/server';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/lib/platform/db';
import { JSON_BODY_LIMIT, SPEC_BODY_LIMIT, WEBHOOK_BODY_LIMIT } from '@/lib/http/server';
import * as webhookRoute from '@/app/api/payments/webhook/route';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import * as specRoute from '@/app/api/studio/grooms/[groomId]/spec/route';

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

describe('a groom spec, which carries its painted maps', () => {
  it('is taken well past 1 MB (a 16-bit map of a million vertices), and refused past SPEC_BODY_LIMIT', async () => {
    const groomer = await signedInAccount('groomer', 'spec-limit');
    const groomId = '00000000-0000-4000-8000-000000000000';
    // 2.7 MB of base64: one 16-bit map for 1,000,000 vertices (lib/groom/spec/maps.ts).
    const map = { attribute: 'length', vertices: 1_000_000, faces: 2_000_000, signature: '0123abcd', bits: 16, low: 0, high: 2, data: 'A'.repeat(4 * Math.ceil(2_000_000 / 3)) };
    const body = JSON.stringify({ baseRevision: 1, spec: { specVersion: 3, units: 'cm', upAxis: 'y', maps: [map] } });
    expect(body.length).toBeGreaterThan(2 * JSON_BODY_LIMIT);
    // Read and validated (the groom is not this groomer's), not refused for its size.
    const taken = await callRoute(specRoute, 'PUT', `/api/studio/grooms/${groomId}/spec`, { cookie: groomer.cookie, body, params: { groomId } });
    expect(taken.status).not.toBe(413);
    expect([400, 404]).toContain(taken.status);
    const { stream, pulled } = endlessBody();
    const request = new NextRequest(new URL(`/api/studio/grooms/${groomId}/spec`, process.env.NEXTAUTH_URL), {
      method: 'PUT',
      headers: { 'content-type': 'application/json', 'content-length': String(SPEC_BODY_LIMIT + 1), cookie: groomer.cookie },
      body: stream,
      duplex: 'half',
    } as ConstructorParameters<typeof NextRequest>[1]);
    const refused = await expectJson(await withinRequest(request, () => specRoute.PUT(request, { params: Promise.resolve({ groomId }) })), 413);
    expect(refused.error).toEqual({ code: 'too-large', message: 'The request body is larger than 40 MB, the most this address accepts.' });
    expect(pulled.bytes).toBeLessThanOrEqual(2 * 64 * 1024);
  });
});
