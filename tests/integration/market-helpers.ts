// Shared steps of the market's integration tests: people, listings made from the demo grooms of
// lib/groom, paying on the payments fake's hosted page, and delivering its signed events to the
// webhook route. Everything goes through the real modules, PostgreSQL, storage and the fake.
import { randomUUID } from 'node:crypto';
import type Stripe from 'stripe';
import { db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { payments } from '@/lib/platform/payments';
import { getObjectBytes, putObject } from '@/lib/platform/storage';
import { parseGroomSpec } from '@/lib/groom';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import type { Actor } from '@/lib/accounts/actor';
import type { Role } from '@/lib/accounts/roles';
import { POST as webhookPost } from '@/app/api/payments/webhook/route';
import { startCheckout } from '@/lib/market/payments/checkout';
import { expect } from 'vitest';
import { uniqueEmail } from './helpers';
import { serveRoute } from './route-server';

export async function makePerson(label: string, roles: Role[]): Promise<Actor> {
  const email = uniqueEmail(label);
  const [user] = await db()('users')
    .insert({ email, display_name: `${label} ${email.slice(-18, -14)}`, password_hash: 'not-used-in-these-tests', email_verified_at: db().fn.now() })
    .returning('id');
  await db()('user_roles').insert(roles.map((role) => ({ user_id: user.id, role })));
  return { userId: user.id, roles, email };
}

const ring = DEMO_GROOMS.find((groom) => groom.id === 'loop-plush-ring')!;
let ringObj: Uint8Array | undefined;

/** The demo ring's surface in storage (once per test file), as the studio would have it. */
export async function ringSurfaceKey(): Promise<string> {
  const key = `tests/market/${randomUUID()}/loop.obj`;
  ringObj ??= new TextEncoder().encode(surfaceToObj(ring.surface(), 'Loop, a plush ring'));
  await putObject(key, ringObj, 'text/plain');
  return key;
}

/** A surface (the demo ring), a groom on it and saved versions of it named `versionNames` (numbered 1, 2, …), as the studio keeps them. */
export async function studioGroom(owner: Actor, versionNames: string[]) {
  const objectKey = await ringSurfaceKey();
  const surfaceBytes = await getObjectBytes(objectKey);
  const [surface] = await db()('growth_surfaces')
    .insert({
      owner_id: owner.userId,
      name: 'Loop',
      file_name: 'loop.obj',
      format: 'obj',
      units: 'cm',
      object_key: objectKey,
      byte_size: surfaceBytes.byteLength,
      vertex_count: 1,
      face_count: 1,
      component_count: 1,
      boundary_loop_count: 0,
      genus: 1,
      euler_characteristic: 0,
      area_cm2: 1,
      components: JSON.stringify([]),
    })
    .returning('id');
  const spec = JSON.stringify(parseGroomSpec(ring.spec));
  const [groom] = await db()('grooms').insert({ owner_id: owner.userId, surface_id: surface.id, name: 'Loop the plush ring', spec }).returning('id');
  const versionIds: string[] = [];
  for (const [index, name] of versionNames.entries()) {
    const [version] = await db()('groom_versions').insert({ groom_id: groom.id, number: index + 1, name, spec, source_revision: index + 1 }).returning('id');
    versionIds.push(version.id);
  }
  return { surfaceId: surface.id as string, groomId: groom.id as string, versionIds, objectKey, surfaceBytes };
}

export type ListingOptions = Partial<{
  title: string;
  description: string;
  animal: string;
  coatLength: string;
  style: string;
  bodyRegion: string;
  priceCents: number;
  currency: string;
  formats: string[];
  guideCount: number | null;
  state: string;
  publishedAt: Date;
  salesCount: number;
  ratingAverage: number | null;
  ratingCount: number;
  assetsStatus: string;
  licence: string;
  /** The measures the search filters on (lib/market/listing-facts.ts); null as before the asset job. */
  guidesPerCm2: number | null;
  typicalLengthCm: number | null;
}>;

/**
 * A listing row as the market keeps it, straight in the database (for set-ups that need many, or
 * a given state). Its surface is the demo ring's, copied into storage under the listing's prefix
 * by the asset job (see lib/market/assets.ts) when that runs.
 */
export async function insertListing(seller: Actor, options: ListingOptions = {}, surfaceKey?: string): Promise<string> {
  const licence = await db()('licences').where({ slug: options.licence ?? 'personal' }).first('id');
  const [row] = await db()('listings')
    .insert({
      seller_id: seller.userId,
      groom_id: randomUUID(),
      groom_version_id: randomUUID(),
      groom_name: 'Loop',
      version_number: 1,
      version_name: 'plush',
      spec: JSON.stringify(parseGroomSpec(ring.spec)),
      surface_key: surfaceKey ?? 'tests/market/none.obj',
      surface_file_name: 'loop.obj',
      title: options.title ?? 'Plush ring coat',
      description: options.description ?? 'Short plush pile for a ring-shaped toy, one whorl and one saddle.',
      animal: options.animal ?? 'toy',
      coat_length: options.coatLength ?? 'short',
      style: options.style ?? 'plush',
      body_region: options.bodyRegion ?? 'full-body',
      price_cents: options.priceCents ?? 1200,
      currency: options.currency ?? 'eur',
      licence_id: licence.id,
      formats: options.formats ?? ['usda', 'obj', 'json'],
      guide_count: options.guideCount === undefined ? 1277 : options.guideCount,
      state: options.state ?? 'published',
      published_at: options.state && options.state !== 'published' ? null : (options.publishedAt ?? new Date()),
      sales_count: options.salesCount ?? 0,
      rating_average: options.ratingAverage ?? null,
      rating_count: options.ratingCount ?? 0,
      assets_status: options.assetsStatus ?? 'ready',
      guides_per_cm2: options.guidesPerCm2 ?? null,
      typical_length_cm: options.typicalLengthCm ?? null,
    })
    .returning('id');
  return row.id;
}

/** Pays an open checkout on the fake's hosted page with a test card; the answer of the form post. */
export async function payOnHostedPage(url: string, card: string): Promise<{ status: number; location: string | null; page: string }> {
  const page = await fetch(url);
  if (page.status !== 200) throw new Error(`the checkout page answered ${page.status}`);
  const form = (await page.text()).match(/<form method="post" action="([^"]+)"/);
  if (!form) throw new Error('the checkout page has no payment form');
  const response = await fetch(new URL(form[1], url), {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ card, expiry: '12/34', cvc: '123' }),
    redirect: 'manual',
  });
  return { status: response.status, location: response.headers.get('location'), page: await response.text() };
}

/** The fake's events about a session or its payment, oldest first. */
export async function eventsAbout(session: { id: string; paymentIntent?: string | null }, types?: string[]): Promise<Stripe.Event[]> {
  const found: Stripe.Event[] = [];
  for await (const event of payments().events.list({ limit: 100 })) {
    const object = event.data.object as { id?: string; payment_intent?: string | null };
    const matches = object.id === session.id || (session.paymentIntent && (object.payment_intent === session.paymentIntent || object.id === session.paymentIntent));
    if (matches && (!types || types.includes(event.type))) found.push(event);
  }
  return found.reverse();
}

export function signedRequest(payload: string, options: { signature?: string | null; timestamp?: number; secret?: string } = {}) {
  const headers = new Headers({ 'content-type': 'application/json' });
  const signature =
    options.signature !== undefined
      ? options.signature
      : payments().webhooks.generateTestHeaderString({ payload, secret: options.secret ?? env().STRIPE_WEBHOOK_SECRET, timestamp: options.timestamp });
  if (signature !== null) headers.set('stripe-signature', signature);
  return new Request('http://127.0.0.1/api/payments/webhook', { method: 'POST', headers, body: payload });
}

/** Delivers one event to the webhook route, signed as the provider would; the route's response. */
export function deliver(event: Stripe.Event | object, options: Parameters<typeof signedRequest>[1] = {}) {
  return webhookPost(signedRequest(JSON.stringify(event), options));
}

/**
 * Serves the webhook route on the app's own port for the duration of a test, so the fake's own
 * deliveries (signed by the fake, retried by it) reach the real route handler over HTTP.
 */
export async function serveWebhookRoute(): Promise<{ close: () => Promise<void>; delivered: () => number }> {
  const route = await serveRoute(webhookPost, Number(new URL(env().NEXTAUTH_URL).port));
  return { delivered: route.served, close: route.close };
}

export async function waitFor<T>(what: string, probe: () => Promise<T | undefined | null | false>, timeoutMs = 20_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

export function shuffle<T>(items: T[], seed = 7): T[] {
  const out = [...items];
  let state = seed;
  for (let i = out.length - 1; i > 0; i--) {
    state = (state * 1103515245 + 12345) & 0x7fffffff;
    const j = state % (i + 1);
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Buys a listing as a buyer does: checkout, the test card on the fake's page, the signed event delivered; the purchase id. */
export async function buyListing(buyer: Actor, listingId: string): Promise<string> {
  const checkout = await startCheckout(buyer, listingId);
  expect((await payOnHostedPage(checkout.url, '4242424242424242')).status).toBe(303);
  const [completed] = await eventsAbout({ id: checkout.sessionId }, ['checkout.session.completed']);
  expect((await deliver(completed)).status).toBe(200);
  return (await db()('purchases').where({ checkout_session_id: checkout.sessionId }).first('id')).id;
}
